import { flushPromises } from '@vue/test-utils'
import { describe, expect, it, vi } from 'vitest'

vi.mock('@/api/dev-mail', () => ({ listMail: vi.fn(async () => []), getMail: vi.fn(), emptyMailbox: vi.fn() }))
vi.mock('@/api/incidents', () => ({ listIncidents: vi.fn(async () => ({ items: [], total: 3, page: 1, pageSize: 1 })) }))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [
    { id: 3, name: 'Front shop', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 4 },
    { id: 5, name: 'Fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 9 },
  ]),
}))

import type { Role } from '@shared/schemas/auth'
import AppShell from '@/components/layout/AppShell.vue'
import { navGroups } from '@/components/layout/nav-groups'
import { useAuthStore } from '@/stores/auth'
import { mountView } from './mount'

type Shown = Record<string, string[]>

async function shownTo(role: Role, clientId: number | null = null): Promise<{ groups: Shown; landmarks: string[]; html: string; text: string }> {
  const { wrapper } = await mountView(AppShell, { role })
  if (clientId) useAuthStore().user!.clientId = clientId
  await flushPromises()
  const groups: Shown = {}
  for (const group of wrapper.findAll('[role="group"]')) {
    const label = document.getElementById(group.attributes('aria-labelledby')!)!.textContent!.trim()
    groups[label] = group.findAll('.v-list-item-title').map((t) => t.text())
  }
  const landmarks = wrapper.findAll('[role="navigation"]').map((n) => n.attributes('aria-label')!)
  const result = { groups, landmarks, html: wrapper.html(), text: wrapper.text() }
  wrapper.unmount()
  return result
}

describe('the side navigation', () => {
  it('shows an owner every entry in four labelled blocks, with the open-incident count and the walls', async () => {
    const owner = await shownTo('owner')
    expect(owner.groups).toEqual({
      Today: ['Overview', 'Incidents', 'Care today', 'My round'],
      Tanks: ['Tanks', 'Livestock', 'Supplies', 'Import readings'],
      Clients: ['Clients', 'Visits'],
      Business: ['Sites', 'Reports', 'People', 'Backup', 'Test mailbox', 'Account'],
    })
    expect(owner.landmarks).toEqual(['Main', 'Walls', 'Tanks by site', 'Duty roster by site'])
    expect(owner.html).toContain('data-test="nav-open-incidents"')
    expect(owner.html).toContain('aria-label="3 open"')
    expect(owner.html).toContain('aria-label="Wall of Front shop"')
    expect(owner.html).toContain('aria-label="Wall of Fish room"')
  })

  it('keeps the owner-only entries from keepers', async () => {
    expect((await shownTo('keeper')).groups).toEqual({
      Today: ['Overview', 'Incidents', 'Care today', 'My round'],
      Tanks: ['Tanks', 'Livestock', 'Supplies', 'Import readings'],
      Clients: ['Clients', 'Visits'],
      Business: ['Sites', 'Reports', 'Account'],
    })
  })

  it('shows a viewer what they may open, and a client’s person nothing kept per site', async () => {
    expect((await shownTo('viewer')).groups).toEqual({
      Today: ['Incidents', 'Care today'],
      Tanks: ['Tanks', 'Livestock', 'Supplies'],
      Visits: ['Visit reports'],
      Business: ['Sites', 'Reports', 'Account'],
    })
    expect(navGroups({ canEdit: false, isOwner: false, isClient: true, devMail: false }).map((g) => [g.title, g.items.map((i) => i.title)])).toEqual([
      ['Tanks', ['Tanks']],
      ['Visits', ['Visit reports']],
      ['Business', ['Reports', 'Account']],
    ])
  })

  it('links every entry to a route the router has', async () => {
    const { routes } = await import('@/router/routes')
    const names = new Set(routes.flatMap((r) => [r.name, ...(r.children ?? []).map((c) => c.name)]))
    const entries = navGroups({ canEdit: true, isOwner: true, isClient: false, devMail: true }).flatMap((g) => g.items)
    expect(entries.filter((e) => !names.has(e.to.name))).toEqual([])
  })
})
