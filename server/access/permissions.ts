import type { Role } from '@shared/schemas/auth'

type Caller = Role | 'wall'

/** The one place that says which roles may do what. Routes name a permission, never a role. */
export const PERMISSIONS = {
  'wall.read': ['owner', 'keeper', 'viewer', 'wall'],
  'org.read': ['owner', 'keeper', 'viewer'],
  'sites.write': ['owner'],
  'tanks.write': ['owner', 'keeper'],
  'tanks.archive': ['owner'],
  'users.manage': ['owner'],
  'devices.manage': ['owner'],
  'kit.write': ['owner', 'keeper'],
  'rules.manage': ['owner'],
  'walls.manage': ['owner'],
  'mail.dev': ['owner'],
  'snoozes.write': ['owner', 'keeper'],
  'maintenance.write': ['owner', 'keeper'],
  'incidents.handle': ['owner', 'keeper'],
  'roster.manage': ['owner'],
  'care.write': ['owner', 'keeper'],
  'care.manage': ['owner'],
  'photos.write': ['owner', 'keeper'],
  'reports.read': ['owner', 'keeper', 'viewer'],
  'reports.manage': ['owner'],
  'org.backup': ['owner'],
  'imports.write': ['owner', 'keeper'],
  'builds.write': ['owner', 'keeper'],
  'org.setup': ['owner'],
  'org.settings': ['owner'],
  'overview.read': ['owner', 'keeper'],
  'clients.read': ['owner', 'keeper'],
  'clients.manage': ['owner'],
  /** Rounds and visits: a keeper works their own, an owner plans everyone's. */
  'visits.work': ['owner', 'keeper'],
  'visits.manage': ['owner'],
  /** Closed visits' reports: a client's people read their own. */
  'visits.read': ['owner', 'keeper', 'viewer'],
  'labels.print': ['owner'],
  // One's own notification devices and alert channels.
  'account.alerts': ['owner', 'keeper', 'viewer'],
} as const satisfies Record<string, readonly Caller[]>

export type Permission = keyof typeof PERMISSIONS

export function roleAllows(role: Caller, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Caller[]).includes(role)
}
