import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, nextTick, ref } from 'vue'
import type { PublicIncident } from '@shared/schemas/incidents'
import type { WallTank } from '@shared/schemas/wall'
import type { LiveIncidentChange } from '@/composables/useLiveSocket'

vi.mock('@/api/incidents', () => ({ listIncidents: vi.fn() }))
vi.mock('@/api/tanks', () => ({ listTanks: vi.fn(async () => ({ items: [{ id: 12, name: 'Reef display' }], total: 1, page: 1, pageSize: 200 })) }))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [{ id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 }]),
}))
// The real live refresh, watched: the list tests call its reload and change handler themselves.
vi.mock('@/composables/useIncidentRefresh', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/composables/useIncidentRefresh')>()
  return { ...actual, useIncidentRefresh: vi.fn(actual.useIncidentRefresh) }
})
vi.mock('@/api/wall', () => ({ getWall: vi.fn(), listWallCredentials: vi.fn(), createWallCredential: vi.fn(), revokeWallCredential: vi.fn() }))

import { listIncidents } from '@/api/incidents'
import { getWall } from '@/api/wall'
import LiveAnnouncer from '@/components/common/LiveAnnouncer.vue'
import TankIncidentsPanel from '@/components/incidents/TankIncidentsPanel.vue'
import { ANNOUNCE_GATHER_MS, announce } from '@/composables/useAnnouncer'
import { useIncidentRefresh } from '@/composables/useIncidentRefresh'
import { resetLiveSocket } from '@/composables/useLiveSocket'
import { announceStateChanges, withNewerReadings } from '@/composables/useTankState'
import IncidentsView from '@/views/IncidentsView.vue'
import WallView from '@/views/WallView.vue'
import { wallPayload, wallTank } from './fixtures/wall'
import { mountView } from './mount'

const incident = (id: number, state: PublicIncident['state'], title: string): PublicIncident => ({
  id,
  siteId: 3,
  tankId: 12,
  tankName: 'Reef display',
  siteName: 'Back fish room',
  ruleId: 9,
  ruleKind: 'above',
  metric: 'temperature',
  severity: 'alarm',
  title,
  state,
  conditionSince: '2026-03-03T02:00:00.000Z',
  openedAt: '2026-03-03T02:10:00.000Z',
  firstValue: 28.4,
  peakValue: 28.6,
  latestValue: 28.5,
  latestAt: '2026-03-03T02:40:00.000Z',
  snoozed: false,
  acknowledgedAt: null,
  acknowledgedBy: null,
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
})
const page = (...items: PublicIncident[]) => ({ items, total: items.length, page: 1, pageSize: 25 })
const gathered = () => new Promise((resolve) => setTimeout(resolve, ANNOUNCE_GATHER_MS + 50))

/** The app shell's live region, mounted on its own: every view shares it. */
async function region() {
  const { wrapper } = await mountView(LiveAnnouncer)
  return () => wrapper.find('[data-test=live-announcer]')
}

/** The next list's live hooks, as it hands them to the socket: its reload and its change handler. */
function catchLiveHooks() {
  vi.mocked(useIncidentRefresh).mockImplementationOnce(() => undefined)
  return () => {
    const call = vi.mocked(useIncidentRefresh).mock.calls.at(-1)!
    return { reload: call[1], changed: call[2]! }
  }
}
const change = (incidentId: number, state: string): LiveIncidentChange => ({ type: 'incident', incidentId, tankId: 12, siteId: 3, state })

beforeEach(() => {
  vi.mocked(listIncidents).mockReset()
})
afterEach(() => {
  resetLiveSocket()
})

describe('the live region', () => {
  it('is polite and atomic, and reads the same words again when they come again', async () => {
    const text = await region()
    expect(text().attributes()).toMatchObject({ role: 'status', 'aria-live': 'polite', 'aria-atomic': 'true' })
    announce('Reef display is now Watch.')
    await gathered()
    expect(text().text()).toBe('Reef display is now Watch.')
    announce('Reef display is now Watch.')
    await nextTick()
    expect(text().text()).toBe('')
    await gathered()
    expect(text().text()).toBe('Reef display is now Watch.')
  })
})

describe('the incidents list announces what changed live', () => {
  it('an incident opened, acknowledged and resolved; not an escalation, not a filter change', async () => {
    const text = await region()
    const a = incident(55, 'open', 'Temperature above 28 °C')
    vi.mocked(listIncidents).mockResolvedValue(page(a))
    const liveHooks = catchLiveHooks()
    const { wrapper } = await mountView(IncidentsView, { role: 'keeper', path: '/incidents' })
    await flushPromises()
    await gathered()
    const before = text().text()
    const { reload, changed } = liveHooks()

    // An escalation: the socket says the incident changed, but its state is the same.
    changed(change(55, 'open'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe(before)

    const b = incident(56, 'open', 'pH below 6.0')
    vi.mocked(listIncidents).mockResolvedValue(page(b, a))
    changed(change(56, 'open'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Incident opened on Reef display: pH below 6.0.')

    vi.mocked(listIncidents).mockResolvedValue(page(b, { ...a, state: 'acknowledged' }))
    changed(change(55, 'acknowledged'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Incident acknowledged on Reef display: Temperature above 28 °C.')

    vi.mocked(listIncidents).mockResolvedValue(page({ ...b, state: 'resolved' }, { ...a, state: 'acknowledged' }))
    changed(change(56, 'resolved'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Incident resolved on Reef display: pH below 6.0.')
    wrapper.unmount()
  })
})

describe('the tank page announces', () => {
  it('a new incident on the tank, and not its acknowledgement', async () => {
    const text = await region()
    vi.mocked(listIncidents).mockResolvedValue(page())
    const liveHooks = catchLiveHooks()
    await mountView(TankIncidentsPanel, { props: { tankId: 12 } })
    await flushPromises()
    const { reload, changed } = liveHooks()

    vi.mocked(listIncidents).mockResolvedValue(page(incident(57, 'open', 'Water level below the heater')))
    changed(change(57, 'open'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Incident opened on Reef display: Water level below the heater.')

    announce('Something else.')
    await gathered()
    vi.mocked(listIncidents).mockResolvedValue(page(incident(57, 'acknowledged', 'Water level below the heater')))
    changed(change(57, 'acknowledged'))
    reload()
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Something else.')
  })

  it('a new reading that moves the tank out of its band, and back', async () => {
    const text = await region()
    const wall = wallTank(12, { name: 'Reef display' })
    const latest = ref<WallTank['latest']>({})
    const Host = defineComponent({
      setup() {
        announceStateChanges(() => withNewerReadings(wall, latest.value))
        return () => h('div')
      },
    })
    await mountView(Host)
    announce('Opened.')
    await gathered()

    // The tank's temperature band is 24–27 °C.
    latest.value = { temperature: { value: 25.5, time: '2026-03-03T12:01:00.000Z', source: 'device' } }
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Opened.')

    latest.value = { temperature: { value: 28.1, time: '2026-03-03T12:02:00.000Z', source: 'device' } }
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Reef display is now Watch: temperature 28.1 outside 24–27.')

    latest.value = { temperature: { value: 25.6, time: '2026-03-03T12:03:00.000Z', source: 'device' } }
    await flushPromises()
    await gathered()
    expect(text().text()).toBe('Reef display is now Steady.')
  })
})

describe('the wall says nothing', () => {
  it('has no live region, and a reading, an incident and a dropped connection announce nothing', async () => {
    const { FakeSocket } = await import('./fixtures/fake-socket')
    FakeSocket.instances = []
    vi.stubGlobal('WebSocket', FakeSocket)
    localStorage.setItem('tw.wallKey', 'tww_display_key_123')
    localStorage.setItem('tw.wallSiteId', '3')
    const text = await region()
    announce('Before the wall.')
    await gathered()
    try {
      vi.mocked(getWall).mockResolvedValue(
        wallPayload(2, {
          siteIncidents: [{ id: 4, title: 'Power cut', severity: 'alarm', state: 'open', tanks: 2, openedAt: '2026-03-03T11:00:00.000Z' }] as never,
        }),
      )
      const { wrapper } = await mountView(WallView, { props: { siteId: 3 } })
      await flushPromises()
      const socket = FakeSocket.instances[0]!
      socket.open()
      socket.frame({ type: 'ready', role: 'wall' })
      socket.frame({ type: 'readings', readings: [{ tankId: 2, metric: 'temperature', time: new Date().toISOString(), value: 29.9, source: 'device' }] })
      socket.frame({ type: 'incident', incidentId: 9, tankId: 2, siteId: 3, state: 'open' })
      await flushPromises()
      socket.drop()
      await flushPromises()
      await gathered()
      expect(wrapper.find('[data-test=wall-site-incident]').exists()).toBe(true)
      expect(wrapper.findAll('[aria-live], [role=status], [role=alert], [role=log], [role=marquee], [role=timer]')).toHaveLength(0)
      expect(text().text()).toBe('Before the wall.')
    } finally {
      vi.unstubAllGlobals()
    }
  })
})
