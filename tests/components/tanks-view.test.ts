import { flushPromises } from '@vue/test-utils'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { TankListItem } from '@shared/schemas/tanks'

vi.mock('@/api/tanks', () => ({
  listTanks: vi.fn(),
  getTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  archiveTank: vi.fn(),
  unarchiveTank: vi.fn(),
}))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [{ id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 }]),
  createSite: vi.fn(),
  updateSite: vi.fn(),
  archiveSite: vi.fn(),
  unarchiveSite: vi.fn(),
}))

import { listTanks } from '@/api/tanks'
import { useLiveStore } from '@/stores/live'
import TanksView from '@/views/TanksView.vue'
import { mountView } from './mount'
import { restoreViewport, viewportWidth } from './viewport'

const readAt = new Date(Date.now() - 3 * 60_000).toISOString()
const tank: TankListItem = {
  id: 41,
  name: 'Discus row 2',
  siteId: 3,
  siteName: 'Back fish room',
  clientId: null,
  clientName: null,
  kind: 'tropical_freshwater',
  stage: 'established',
  dimensions: { shape: 'rectangular', lengthCm: 120, widthCm: 50, heightCm: 50 },
  volumeLitres: 300,
  volumeSource: 'dimensions',
  substrateDepthCm: 0,
  heater: { watts: 300, setPointC: 29, topCm: 35 },
  filter: '',
  media: '',
  lightSchedule: null,
  targets: { temperature: { min: 24, max: 30 }, ph: { min: 6, max: 7 } },
  notes: '',
  sortOrder: 0,
  archivedAt: null,
  createdAt: '2025-01-01T00:00:00.000Z',
  updatedAt: '2025-01-01T00:00:00.000Z',
  status: {
    state: 'steady',
    stateReasons: [],
    latest: { temperature: { value: 27.1, time: readAt, source: 'device' }, ph: { value: 6.5, time: readAt, source: 'test_kit' } },
    openIncidents: [],
    quietDevices: [],
    hasDevices: true,
  },
}

afterEach(restoreViewport)

beforeEach(() => {
  viewportWidth(1280)
  vi.mocked(listTanks).mockReset()
  vi.mocked(listTanks).mockResolvedValue({ items: [tank], total: 1, page: 1, pageSize: 25 })
})

describe('TanksView', () => {
  it('lists the page the server returned, asking for page 1 sorted by name', async () => {
    const { wrapper } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    expect(listTanks).toHaveBeenCalledWith(expect.objectContaining({ page: 1, pageSize: 25, sortBy: 'name', sortDesc: false }))
    const row = wrapper.find('tbody tr')
    expect(row.text()).toContain('Discus row 2')
    expect(row.text()).toContain('Back fish room')
    expect(row.text()).toContain('Established')
    expect(row.find('[data-test="tank-state"]').text()).toBe('Steady')
    expect(row.find('[data-test="tank-state-icon"]').classes()).toContain('mdi-check-circle')
    expect(row.find('[data-test="latest-temperature"]').text()).toBe('27.1 °C · 3 min ago')
    expect(row.find('[data-test="latest-ph"]').text()).toBe('pH 6.50 · 3 min ago')
    expect(row.find('[data-test="no-open-incidents"]').text()).toBe('None open')
    expect(wrapper.find('thead').text()).toContain('Tank volume')
    expect(row.text()).toContain('300 L')
    expect(wrapper.find('[data-test="volume-note"]').text()).toContain('Tank volume is what the tank holds to the rim')
  })

  it('stacks each tank into one cell on a phone, with the same state, values and volume', async () => {
    viewportWidth(390)
    const { wrapper } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    expect(wrapper.findAll('thead th').map((th) => th.text())).toEqual(['Tank'])
    const card = wrapper.find('tbody tr [data-test="tank-row"]')
    expect(card.find('[data-test="tank-state"]').text()).toBe('Steady')
    expect(card.find('[data-test="latest-temperature"]').text()).toBe('27.1 °C · 3 min ago')
    expect(card.text()).toContain('Back fish room · Established · 300 L tank volume')
  })

  it('moves the value and the state when a reading arrives on the live socket', async () => {
    const { wrapper } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    // 30.4 °C is above the 24–30 °C band: the same rule as the wall makes the tank one to watch.
    useLiveStore().ingest([{ tankId: 41, metric: 'temperature', value: 30.4, time: new Date().toISOString(), source: 'device' }])
    await flushPromises()
    const row = wrapper.find('tbody tr')
    expect(row.find('[data-test="latest-temperature"]').text()).toBe('30.4 °C · just now')
    expect(row.find('[data-test="tank-state"]').text()).toBe('Watch')
    expect(row.find('[data-test="tank-state-icon"]').classes()).toContain('mdi-eye')
  })

  it('shows each open incident with a link to it, and an alarm incident makes the tank an alarm', async () => {
    vi.mocked(listTanks).mockResolvedValue({
      items: [
        {
          ...tank,
          status: {
            ...tank.status,
            state: 'alarm',
            openIncidents: [
              {
                id: 9,
                title: 'Temperature above 30 °C for 10 min',
                severity: 'alarm',
                openedAt: readAt,
                state: 'open',
                maintenance: false,
                siteIncidentId: null,
                flapCount: 0,
              },
            ],
          },
        },
      ],
      total: 1,
      page: 1,
      pageSize: 25,
    })
    const { wrapper } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    const row = wrapper.find('tbody tr')
    expect(row.find('[data-test="tank-state"]').text()).toBe('Alarm')
    const link = row.find('[data-test="open-incidents"] a')
    expect(link.text()).toBe('alarm: Temperature above 30 °C for 10 min')
    expect(link.attributes('href')).toBe('/incidents/9')
  })

  it('shows no "New tank" button to a viewer', async () => {
    const { wrapper } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    expect(wrapper.text()).toContain('Discus row 2')
    expect(wrapper.find('[data-test="new-tank"]').exists()).toBe(false)
    expect(wrapper.findAll('a, button').some((el) => el.text() === 'New tank')).toBe(false)
  })

  it('shows the "New tank" button to a keeper, linking to the new-tank page', async () => {
    const { wrapper } = await mountView(TanksView, { role: 'keeper' })
    await flushPromises()

    const button = wrapper.find('[data-test="new-tank"]')
    expect(button.exists()).toBe(true)
    expect(button.text()).toBe('New tank')
    expect(button.attributes('href')).toBe('/tanks/new')
  })

  it('opens the tank when its row is clicked', async () => {
    const { wrapper, router } = await mountView(TanksView, { role: 'viewer' })
    await flushPromises()

    await wrapper.find('tbody tr').trigger('click')
    await vi.waitFor(() => expect(router.currentRoute.value.fullPath).toBe('/tanks/41'))
  })
})
