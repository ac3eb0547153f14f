import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { acclimationPlan } from '@shared/care/acclimation'
import { SPECIES, speciesByKey } from '@shared/care/species'

vi.mock('@/api/care')
vi.mock('@/api/livestock')

import { addLivestock, listLivestock, listSpecies, updateLivestock } from '@/api/care'
import { recordBatchLoss } from '@/api/livestock'
import type { PublicLivestockEntry } from '@shared/schemas/care-api'
import LivestockPanel from '@/components/care/LivestockPanel.vue'
import { mountView } from '../mount'
import { careTank } from './fixtures'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)

const neon: PublicLivestockEntry = {
  id: 31,
  tankId: 12,
  speciesKey: 'neon_tetra',
  species: speciesByKey('neon_tetra') ?? null,
  name: 'Neon tetra',
  category: 'fish',
  count: 12,
  losses: 1,
  movedOut: 0,
  parentId: null,
  addedAt: '2026-03-03T09:00:00.000Z',
  source: 'Harbour wholesale',
  notes: '',
  removedAt: null,
  watchUntil: '2026-03-06T09:00:00.000Z',
}
const cyclingWarning = 'The tank is still cycling: ammonia and nitrite can harm animals until it is cycled'

beforeEach(() => {
  vi.mocked(listLivestock).mockReset()
  vi.mocked(listLivestock).mockResolvedValue({ entries: [], watchUntil: null, quarantine: null })
  vi.mocked(listSpecies).mockResolvedValue([...SPECIES])
  vi.mocked(addLivestock).mockReset()
  vi.mocked(updateLivestock).mockReset()
  vi.mocked(recordBatchLoss).mockReset()
})

async function mountPanel() {
  const { wrapper } = await mountView(LivestockPanel, { role: 'keeper', props: { tank: { ...careTank, stage: 'cycling' }, canWrite: true, timeZone: 'UTC' } })
  await flushPromises()
  return wrapper
}

describe('LivestockPanel', () => {
  it('adds fish, shows the server warnings and opens the acclimation timer with the watch period', async () => {
    vi.mocked(addLivestock).mockResolvedValue({
      entry: { ...neon, losses: 0 },
      warnings: [{ code: 'tank_cycling', message: cyclingWarning }],
      acclimation: { ...acclimationPlan({ bagLitres: 0.5, intervalMinutes: 5 }), tankTempC: null, tankPh: null },
      watchUntil: '2026-03-06T09:00:00.000Z',
    })
    vi.mocked(listLivestock).mockResolvedValueOnce({ entries: [], watchUntil: null, quarantine: null })
    vi.mocked(listLivestock).mockResolvedValueOnce({ entries: [{ ...neon, losses: 0 }], watchUntil: '2026-03-06T09:00:00.000Z', quarantine: null })
    const wrapper = await mountPanel()
    await wrapper.find('[data-test="livestock-add"]').trigger('click')
    await flushPromises()

    // Picking from the autocomplete's menu is Vuetify's business; the choice itself is what counts here.
    await wrapper.findComponent({ name: 'VAutocomplete' }).setValue('neon_tetra')
    await flushPromises()
    expect(document.querySelector('[data-test="species-range"]')?.textContent).toContain('Usual range 20–26 °C, pH 6–7.5')
    // The same check the server makes, shown before adding.
    expect(document.querySelector('[data-test="stocking-preview"]')?.textContent).toContain(cyclingWarning)
    await inDocument('input[name="count"]').setValue('12')
    await inDocument('input[name="source"]').setValue('Harbour wholesale')
    await inDocument('input[name="bagLitres"]').setValue('0.5')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()

    expect(addLivestock).toHaveBeenCalledWith(12, {
      speciesKey: 'neon_tetra',
      count: 12,
      source: 'Harbour wholesale',
      notes: '',
      acclimation: { bagLitres: 0.5, intervalMinutes: 5 },
    })
    expect(wrapper.find('[data-test="livestock-warning"]').text()).toBe(cyclingWarning)
    const timer = wrapper.find('[data-test="acclimation-timer"]')
    expect(timer.text()).toContain('12 × Neon tetra')
    // Every 5 minutes over the half hour: six additions, then net at 30 min (common practice).
    expect(wrapper.findAll('[data-test^="acclimation-step-"]')).toHaveLength(6)
    expect(wrapper.find('[data-test="acclimation-net"]').text()).toContain('at 30 min')
    expect(wrapper.find('[data-test="livestock-periods"]').text()).toContain('Watch new arrivals closely until 6 Mar, 09:00')
  })

  it('records a loss with its cause on the batch', async () => {
    vi.mocked(listLivestock).mockResolvedValue({
      entries: [neon],
      watchUntil: null,
      quarantine: { startedAt: '2026-03-03T09:00:00.000Z', endsAt: '2026-03-31T09:00:00.000Z', daysIn: 0, daysRemaining: 28, days: 28 },
    })
    const wrapper = await mountPanel()
    expect(wrapper.find('[data-test="livestock-31"]').text()).toContain('11 in the tank · 1 lost of 12')
    expect(wrapper.find('[data-test="livestock-periods"]').text()).toContain('Quarantine day 1 of 28: 28 days remaining')
    await wrapper
      .findAll('[data-test="livestock-31"] button')
      .find((b) => b.text() === 'Record loss')!
      .trigger('click')
    await flushPromises()
    await inDocument('input[name="lost"]').setValue('2')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    // A loss needs its cause before it goes.
    expect(recordBatchLoss).not.toHaveBeenCalled()
    expect(inDocument('.v-dialog').text()).toContain('say what happened')
    await inDocument('input[name="cause"]').setValue('Jumped out overnight')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(recordBatchLoss).toHaveBeenCalledWith(31, { count: 2, cause: 'Jumped out overnight' })
    expect(updateLivestock).not.toHaveBeenCalled()
  })
})
