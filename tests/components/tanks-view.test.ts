import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { PublicTank } from '@shared/schemas/tanks'

vi.mock('@/api/tanks', () => ({
  listTanks: vi.fn(),
  getTank: vi.fn(),
  createTank: vi.fn(),
  updateTank: vi.fn(),
  archiveTank: vi.fn(),
  unarchiveTank: vi.fn(),
}))
vi.mock('@/api/sites', () => ({
  listSites: vi.fn(async () => [
    { id: 3, name: 'Back fish room', timeZone: 'Europe/Berlin', address: '', notes: '', archivedAt: null, tankCount: 1 },
  ]),
  createSite: vi.fn(),
  updateSite: vi.fn(),
  archiveSite: vi.fn(),
  unarchiveSite: vi.fn(),
}))

import { listTanks } from '@/api/tanks'
import TanksView from '@/views/TanksView.vue'
import { mountView } from './mount'

const tank: PublicTank = {
  id: 41,
  name: 'Discus row 2',
  siteId: 3,
  siteName: 'Back fish room',
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
  targets: {},
  notes: '',
  sortOrder: 0,
  archivedAt: null,
  createdAt: '2025-01-01T00:00:00.000Z',
  updatedAt: '2025-01-01T00:00:00.000Z',
}

beforeEach(() => {
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
    expect(row.text()).toContain('300')
    expect(row.text()).toContain('29.0 °C')
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
