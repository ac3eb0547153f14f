import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import { CYCLED_RULE } from '@shared/care/cycling'

vi.mock('@/api/care')

import { addCareLogEntry, getCycling, listCareLog } from '@/api/care'
import type { PublicCareLogEntry } from '@shared/schemas/care-api'
import CareLogPanel from '@/components/care/CareLogPanel.vue'
import CyclingPanel from '@/components/care/CyclingPanel.vue'
import { mountView } from '../mount'

const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)

const waterChange: PublicCareLogEntry = {
  id: 4,
  tankId: 12,
  kind: 'water_change',
  at: '2026-03-03T09:30:00.000Z',
  by: { id: 7, name: 'Pat keeper' },
  text: 'Water change',
  values: { litres: 20, percent: 11.1, dechlorinatorMl: 4 },
  careTaskId: null,
  waterChangeId: 55,
}

beforeEach(() => {
  vi.mocked(listCareLog).mockReset()
  vi.mocked(listCareLog).mockResolvedValue([waterChange])
  vi.mocked(addCareLogEntry).mockReset()
})

describe('CareLogPanel', () => {
  it('lists entries with kind, time in the site zone, who and values', async () => {
    const { wrapper } = await mountView(CareLogPanel, { role: 'viewer', props: { tankId: 12, canWrite: false, timeZone: 'Europe/Berlin' } })
    await flushPromises()
    const row = wrapper.find('[data-test="care-log-4"]').text()
    // Berlin keeps UTC+1 until the last Sunday of March (EU summer-time rule, Directive 2000/84/EC).
    expect(row).toContain('Water change · 3 Mar, 10:30 · Pat keeper')
    expect(wrapper.find('[data-test="care-log-values"]').text()).toBe('20 L · 11.1 % · 4 mL dechlorinator')
    expect(wrapper.find('[data-test="care-log-add"]').exists()).toBe(false)
  })

  it('shows the newest ten entries, and twenty older ones at each tap', async () => {
    // 35 entries a day apart, newest first, as the API answers.
    const many = Array.from({ length: 35 }, (_, i) => ({
      ...waterChange,
      id: 100 + i,
      at: new Date(Date.parse(waterChange.at) - i * 86_400_000).toISOString(),
    }))
    vi.mocked(listCareLog).mockResolvedValue(many)
    // A page that shows one tank, then another, keeping the panel.
    const tankId = ref(12)
    const Page = defineComponent({ render: () => h(CareLogPanel, { tankId: tankId.value, canWrite: false, timeZone: 'UTC' }) })
    const { wrapper } = await mountView(Page, { role: 'viewer' })
    await flushPromises()
    const rows = () => wrapper.findAll('[data-test^="care-log-1"]').map((r) => r.attributes('data-test'))
    expect(rows()).toEqual(many.slice(0, 10).map((e) => `care-log-${e.id}`))
    const older = wrapper.find('[data-test="care-log-older"]')
    expect(older.text()).toBe('Show older entries (25 more)')
    await older.trigger('click')
    expect(rows()).toHaveLength(30)
    expect(wrapper.find('[data-test="care-log-older"]').text()).toBe('Show older entries (5 more)')
    await wrapper.find('[data-test="care-log-older"]').trigger('click')
    expect(rows()).toHaveLength(35)
    expect(wrapper.find('[data-test="care-log-older"]').exists()).toBe(false)
    // Another tank on the same page: its log starts folded again.
    tankId.value = 13
    await flushPromises()
    expect(rows()).toHaveLength(10)
  })

  it('adds a dosing entry with product and amount', async () => {
    const dosing: PublicCareLogEntry = {
      ...waterChange,
      id: 5,
      kind: 'dosing',
      text: '',
      values: { product: 'Plant food', amount: 5, unit: 'mL' },
      waterChangeId: null,
    }
    vi.mocked(addCareLogEntry).mockResolvedValue(dosing)
    const { wrapper } = await mountView(CareLogPanel, { role: 'keeper', props: { tankId: 12, canWrite: true, timeZone: 'UTC' } })
    await flushPromises()
    await wrapper.find('[data-test="care-log-add"]').trigger('click')
    await flushPromises()
    await wrapper.findComponent({ name: 'VSelect' }).setValue('dosing')
    await flushPromises()
    await inDocument('input[name="product"]').setValue('Plant food')
    await inDocument('input[name="amount"]').setValue('5')
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(vi.mocked(addCareLogEntry).mock.calls[0]?.slice(0, 2)).toEqual([
      12,
      {
        kind: 'dosing',
        text: '',
        values: { product: 'Plant food', amount: 5, unit: 'mL' },
        at: expect.stringMatching(/Z$/),
      },
    ])
    expect(wrapper.find('[data-test="care-log-5"]').text()).toContain('Plant food · 5 mL')
  })
})

describe('CyclingPanel', () => {
  it('shows the peaks, nitrate, the stated rule and the new-plants note', async () => {
    vi.mocked(getCycling).mockResolvedValue({
      tankId: 12,
      stage: 'cycling',
      phase: 'nitrate',
      cycled: false,
      ammoniaPeak: { value: 2, at: '2026-02-10T08:00:00.000Z', passed: true },
      nitritePeak: { value: 1.5, at: '2026-02-20T08:00:00.000Z', passed: true },
      nitrateRising: true,
      zeroSince: '2026-03-01T08:00:00.000Z',
      zeroDays: 2,
      daysToGo: 5,
      rule: CYCLED_RULE,
      newPlants: {
        addedAt: '2026-02-25T08:00:00.000Z',
        daysSince: 6,
        message:
          'New plants can shed leaves and melt back in their first 14–21 days, adding ammonia: test more often and remove dying leaves (common practice)',
      },
      suggestion: null,
    })
    const { wrapper } = await mountView(CyclingPanel, { role: 'viewer', props: { tankId: 12, timeZone: 'UTC' } })
    await flushPromises()
    expect(wrapper.find('[data-test="cycling-phase"]').text()).toBe('Nitrate stage: nearly cycled')
    expect(wrapper.find('[data-test="cycling-cycled"]').text()).toBe('Not yet')
    expect(wrapper.find('[data-test="cycling-ammonia"]').text()).toBe('2.00 mg/L on 10 Feb, 08:00, passed')
    expect(wrapper.find('[data-test="cycling-nitrate"]').text()).toBe('Yes')
    expect(wrapper.find('[data-test="cycling-zero"]').text()).toContain('(2 days); 5 more days to go')
    expect(wrapper.find('[data-test="cycling-rule"]').text()).toBe(CYCLED_RULE)
    expect(wrapper.find('[data-test="cycling-new-plants"]').text()).toContain('Newest plants added 6 days ago.')
  })
})
