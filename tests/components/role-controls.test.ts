import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { Role } from '@shared/schemas/auth'
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
  listSites: vi.fn(),
  createSite: vi.fn(),
  updateSite: vi.fn(),
  archiveSite: vi.fn(),
  unarchiveSite: vi.fn(),
}))

vi.mock('@/api/series', () => ({ getSeries: vi.fn(), getLatest: vi.fn(async () => ({})) }))
vi.mock('@/api/devices', () => ({ listDevices: vi.fn(async () => []), createDevice: vi.fn(), rotateDeviceToken: vi.fn(), revokeDevice: vi.fn() }))
vi.mock('@/api/test-kit', () => ({
  listTestKitEntries: vi.fn(async () => []),
  createTestKitEntry: vi.fn(),
  updateTestKitEntry: vi.fn(),
  deleteTestKitEntry: vi.fn(),
}))
vi.mock('@/api/rules', () => ({
  listTankRules: vi.fn(async () => []),
  createTankRule: vi.fn(),
  overrideSiteRule: vi.fn(),
  listSiteRules: vi.fn(async () => []),
  createSiteRule: vi.fn(),
  updateRule: vi.fn(),
  deleteRule: vi.fn(),
  listSnoozes: vi.fn(async () => []),
  createSnooze: vi.fn(),
  cancelSnooze: vi.fn(),
}))
vi.mock('@/api/incidents', () => ({ listIncidents: vi.fn(async () => ({ items: [], total: 0, page: 1, pageSize: 10 })) }))
vi.mock('@/api/care', () => ({
  listCareTasks: vi.fn(async () => []),
  listCareLog: vi.fn(async () => []),
  listWaterChanges: vi.fn(async () => []),
  listLivestock: vi.fn(async () => ({ entries: [], watchUntil: null, quarantine: null })),
  listSpecies: vi.fn(async () => []),
  getCycling: vi.fn(async () => ({
    tankId: 1,
    stage: 'established',
    phase: 'no_data',
    cycled: false,
    ammoniaPeak: null,
    nitritePeak: null,
    nitrateRising: false,
    zeroSince: null,
    zeroDays: 0,
    daysToGo: null,
    rule: 'Cycled when ammonia and nitrite stay at zero for 7 days',
    newPlants: null,
    suggestion: null,
  })),
}))
vi.mock('@/api/wall', () => ({
  getWall: vi.fn(async () => {
    throw new Error('no wall in this test')
  }),
  listWallCredentials: vi.fn(async () => []),
  createWallCredential: vi.fn(),
  revokeWallCredential: vi.fn(),
}))

import { getTank } from '@/api/tanks'
import { listSites } from '@/api/sites'
import SitesView from '@/views/SitesView.vue'
import TankView from '@/views/TankView.vue'
import { BACK_FISH_ROOM } from './fixtures/site'
import { mountView } from './mount'

const tank: PublicTank = {
  id: 12,
  name: 'Quarantine A',
  siteId: 3,
  siteName: 'Back fish room',
  clientId: null,
  clientName: null,
  kind: 'marine',
  stage: 'quarantine',
  dimensions: null,
  volumeLitres: 80,
  volumeSource: 'entered',
  substrateDepthCm: 0,
  heater: { watts: 100, setPointC: 25, topCm: 20 },
  filter: 'sponge',
  media: '',
  lightSchedule: { on: '10:00', off: '18:00' },
  targets: { temperature: { min: 24, max: 27 }, ph: { min: 8, max: 8.4 } },
  notes: '',
  sortOrder: 0,
  archivedAt: null,
  createdAt: '2025-01-01T00:00:00.000Z',
  updatedAt: '2025-01-01T00:00:00.000Z',
}

beforeEach(() => {
  vi.mocked(getTank).mockResolvedValue(tank)
  vi.mocked(listSites).mockResolvedValue([{ ...BACK_FISH_ROOM, tankCount: 1 }])
})

const buttonTexts = (wrapper: { findAll: (s: string) => { text: () => string }[] }) => wrapper.findAll('a, button').map((el) => el.text())

async function tankPageAs(role: Role) {
  const { wrapper } = await mountView(TankView, { role, props: { id: 12 } })
  await flushPromises()
  return wrapper
}

describe('tank page', () => {
  it('shows the facts, target bands and empty panels', async () => {
    const wrapper = await tankPageAs('viewer')
    const text = wrapper.text()
    expect(text).toContain('Quarantine A')
    expect(text).toContain('80 L')
    expect(text).toContain('25.0 °C')
    expect(text).toContain('10:00–18:00')
    expect(text).toMatch(/Temperature\s24\.0 – 27\.0 °C/)
    expect(text).toMatch(/pH\s8\.00 – 8\.40/)
    for (const empty of [
      'No readings yet — they come from a registered device or a test-kit entry.',
      'No devices on this tank yet.',
      'No watch rules yet.',
      'No snoozes: every alert is sent.',
      'No incidents on this tank yet.',
      'No care tasks on this tank.',
      'No livestock or plants recorded.',
    ]) {
      expect(text).toContain(empty)
    }
  })

  it('gives a viewer no edit, archive, test-kit or device controls', async () => {
    const texts = buttonTexts(await tankPageAs('viewer'))
    expect(texts).not.toContain('Edit tank')
    expect(texts).not.toContain('Archive')
    expect(texts).not.toContain('Log test')
    expect(texts).not.toContain('Register device')
    expect(texts).not.toContain('Add rule')
    expect(texts).not.toContain('Snooze alerts')
  })

  it('lets a keeper edit and log a test but not archive or register devices', async () => {
    const wrapper = await tankPageAs('keeper')
    const texts = buttonTexts(wrapper)
    expect(texts).toContain('Edit tank')
    expect(texts).not.toContain('Archive')
    expect(texts).not.toContain('Register device')
    expect(wrapper.find('[data-test="log-test"]').attributes('href')).toBe('/tanks/12/test-kit')
    expect(texts).toContain('Snooze alerts')
    expect(texts).not.toContain('Add rule')
  })

  it('lets an owner edit, archive and register devices', async () => {
    const texts = buttonTexts(await tankPageAs('owner'))
    expect(texts).toContain('Edit tank')
    expect(texts).toContain('Archive')
    expect(texts).toContain('Register device')
    expect(texts).toContain('Add rule')
  })
})

describe('sites page', () => {
  async function sitesPageAs(role: Role) {
    const { wrapper } = await mountView(SitesView, { role })
    await flushPromises()
    return wrapper
  }

  it('lists the sites to a keeper without any management controls', async () => {
    const wrapper = await sitesPageAs('keeper')
    expect(wrapper.text()).toContain('Back fish room')
    expect(wrapper.find('[data-test="new-site"]').exists()).toBe(false)
    expect(wrapper.find('[aria-label="Edit Back fish room"]').exists()).toBe(false)
    expect(wrapper.find('[aria-label="Archive Back fish room"]').exists()).toBe(false)
  })

  it('gives the owner create, edit and archive controls, and the wall displays panel', async () => {
    const wrapper = await sitesPageAs('owner')
    expect(wrapper.find('[data-test="new-site"]').exists()).toBe(true)
    expect(wrapper.find('[aria-label="Edit Back fish room"]').exists()).toBe(true)
    expect(wrapper.find('[aria-label="Archive Back fish room"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="wall-displays"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="site-rules"]').exists()).toBe(true)
  })

  it('lets everyone open a wall but shows the wall displays panel only to the owner', async () => {
    const wrapper = await sitesPageAs('viewer')
    expect(wrapper.find('[aria-label="Open the wall for Back fish room"]').exists()).toBe(true)
    expect(wrapper.find('[data-test="wall-displays"]').exists()).toBe(false)
    expect(wrapper.find('[data-test="site-rules"]').exists()).toBe(false)
    expect(wrapper.find('[aria-label="Duty roster for Back fish room"]').exists()).toBe(true)
  })
})
