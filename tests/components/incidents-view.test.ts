import { flushPromises } from '@vue/test-utils'
import { describe, expect, it, vi } from 'vitest'
import type { PublicIncident } from '@shared/schemas/incidents'

vi.mock('@/api/incidents', () => ({ listIncidents: vi.fn() }))
vi.mock('@/api/tanks', () => ({ listTanks: vi.fn(async () => ({ items: [{ id: 12, name: 'Reef display' }], total: 1, page: 1, pageSize: 200 })) }))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [{ id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 }]),
}))
vi.mock('@/composables/useIncidentRefresh', () => ({ useIncidentRefresh: vi.fn() }))

import { listIncidents } from '@/api/incidents'
import { useIncidentRefresh } from '@/composables/useIncidentRefresh'
import IncidentsView from '@/views/IncidentsView.vue'
import { mountView } from './mount'

const incident: PublicIncident = {
  id: 55,
  siteId: 3,
  tankId: 12,
  tankName: 'Reef display',
  siteName: 'Back fish room',
  ruleId: 9,
  ruleKind: 'rate',
  metric: 'ph',
  severity: 'warning',
  title: 'pH changed by more than 0.3 in 24 h',
  state: 'acknowledged',
  conditionSince: '2026-03-03T02:00:00.000Z',
  openedAt: '2026-03-03T02:10:00.000Z',
  firstValue: -0.31,
  peakValue: -0.42,
  latestValue: -0.35,
  latestAt: '2026-03-03T02:40:00.000Z',
  snoozed: false,
  acknowledgedAt: '2026-03-03T02:20:00.000Z',
  acknowledgedBy: 21,
  acknowledgeNote: null,
  resolvedAt: null,
  resolvedBy: null,
  resolveNote: null,
  escalationLevel: 0,
  nextEscalationAt: null,
  nextRepeatAt: null,
  topSeverity: 'alarm',
  flapCount: 0,
  lastFlapAt: null,
  settleUntil: null,
  maintenance: false,
  siteIncidentId: null,
  conditionHolds: true,
}

describe('incidents page', () => {
  it('filters by what the address asks, lists by word and icon, and listens live to the site', async () => {
    vi.mocked(listIncidents).mockResolvedValue({ items: [incident], total: 1, page: 1, pageSize: 25 })
    const before = Date.now()
    const { wrapper } = await mountView(IncidentsView, { role: 'viewer', path: '/incidents?siteId=3&state=unresolved' })
    await flushPromises()
    const params = vi.mocked(listIncidents).mock.calls.at(-1)![0]!
    expect(params).toMatchObject({ siteId: 3, state: 'unresolved', tankId: null, severity: null, page: 1, pageSize: 25 })
    // The default range is the last 7 days.
    expect(before - params.from!.getTime()).toBeGreaterThanOrEqual(7 * 86_400_000 - 5000)
    expect(before - params.from!.getTime()).toBeLessThanOrEqual(7 * 86_400_000 + 5000)

    const row = wrapper.find('[data-test="incident-table"] tbody tr').text()
    expect(row).toContain('3 Mar, 03:10')
    expect(row).toContain('pH changed by more than 0.3 in 24 h')
    expect(row).toContain('Reef display')
    expect(row).toContain('Warning')
    expect(row).toContain('Acknowledged')
    expect(row).toContain('pH fell 0.42')
    const stateChip = wrapper.find('[data-test="incident-state"]')
    expect(stateChip.find('.mdi-account-check').exists()).toBe(true)

    const targets = vi.mocked(useIncidentRefresh).mock.calls.at(-1)![0]
    expect(targets()).toEqual([{ siteId: 3 }])
  })
})
