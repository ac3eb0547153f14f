/** One entry of the side navigation. */
export interface NavItem {
  title: string
  icon: string
  to: { name: string }
}

/** A labelled block of entries; a block with no entry for the person is left out. */
export interface NavGroup {
  key: 'today' | 'tanks' | 'clients' | 'business'
  title: string
  items: NavItem[]
}

export interface NavAudience {
  canEdit: boolean
  isOwner: boolean
  /** A client's person sees the client's tanks, reports and visit reports, nothing kept per site. */
  isClient: boolean
  /** The test mailbox exists only on a server without real mail. */
  devMail: boolean
}

const when = <T>(shown: boolean, ...items: T[]): T[] => (shown ? items : [])

/**
 * The side navigation in a few blocks by what a person comes for: what needs doing today, the
 * tanks and what lives in them, the clients and their visits, and running the business.
 */
export function navGroups(a: NavAudience): NavGroup[] {
  const staff = !a.isClient
  const groups: NavGroup[] = [
    {
      key: 'today',
      title: 'Today',
      items: [
        ...when(a.canEdit, { title: 'Overview', icon: 'mdi-view-dashboard-outline', to: { name: 'overview' } }),
        ...when(staff, { title: 'Incidents', icon: 'mdi-bell-alert-outline', to: { name: 'incidents' } }),
        ...when(staff, { title: 'Care today', icon: 'mdi-calendar-check-outline', to: { name: 'care-today' } }),
        ...when(a.canEdit, { title: 'My round', icon: 'mdi-map-marker-path', to: { name: 'round' } }),
      ],
    },
    {
      key: 'tanks',
      title: 'Tanks',
      items: [
        { title: 'Tanks', icon: 'mdi-fishbowl-outline', to: { name: 'tanks' } },
        ...when(staff, { title: 'Livestock', icon: 'mdi-fish', to: { name: 'livestock' } }),
        ...when(staff, { title: 'Supplies', icon: 'mdi-package-variant', to: { name: 'supplies' } }),
        ...when(a.canEdit, { title: 'Import readings', icon: 'mdi-file-upload-outline', to: { name: 'import' } }),
      ],
    },
    {
      key: 'clients',
      title: a.canEdit ? 'Clients' : 'Visits',
      items: [
        ...when(a.canEdit, { title: 'Clients', icon: 'mdi-account-tie-outline', to: { name: 'clients' } }),
        { title: a.canEdit ? 'Visits' : 'Visit reports', icon: 'mdi-clipboard-text-outline', to: { name: 'visits' } },
      ],
    },
    {
      key: 'business',
      title: 'Business',
      items: [
        ...when(staff, { title: 'Sites', icon: 'mdi-map-marker-outline', to: { name: 'sites' } }),
        { title: 'Reports', icon: 'mdi-file-chart-outline', to: { name: 'report' } },
        ...when(a.isOwner, { title: 'People', icon: 'mdi-account-group-outline', to: { name: 'users' } }),
        ...when(a.isOwner, { title: 'Backup', icon: 'mdi-database-export-outline', to: { name: 'backup' } }),
        ...when(a.isOwner && a.devMail, { title: 'Test mailbox', icon: 'mdi-email-lock-outline', to: { name: 'dev-mail' } }),
        { title: 'Account', icon: 'mdi-account-cog-outline', to: { name: 'account' } },
      ],
    },
  ]
  return groups.filter((g) => g.items.length)
}
