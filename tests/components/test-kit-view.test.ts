import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { PublicTank } from '@shared/schemas/tanks'

vi.mock('@/api/tanks', () => ({ listTanks: vi.fn(), getTank: vi.fn(), createTank: vi.fn(), updateTank: vi.fn(), archiveTank: vi.fn(), unarchiveTank: vi.fn() }))
vi.mock('@/api/sites', () => ({ listSites: vi.fn(async () => []), createSite: vi.fn(), updateSite: vi.fn(), archiveSite: vi.fn(), unarchiveSite: vi.fn() }))
vi.mock('@/api/series', () => ({ getSeries: vi.fn(), getLatest: vi.fn() }))
vi.mock('@/api/test-kit', () => ({
  listTestKitEntries: vi.fn(async () => []),
  createTestKitEntry: vi.fn(),
  updateTestKitEntry: vi.fn(),
  deleteTestKitEntry: vi.fn(),
}))

import { getLatest } from '@/api/series'
import { getTank } from '@/api/tanks'
import { createTestKitEntry } from '@/api/test-kit'
import { ApiError } from '@/api/errors'
import TestKitView from '@/views/TestKitView.vue'
import { mountView } from './mount'

const tank = {
  id: 12,
  name: 'Quarantine A',
  siteId: 3,
  siteName: 'Back fish room',
  kind: 'tropical_freshwater',
  stage: 'quarantine',
  dimensions: null,
  volumeLitres: 80,
  volumeSource: 'entered',
  substrateDepthCm: 0,
  heater: null,
  filter: '',
  media: '',
  lightSchedule: null,
  targets: { ammonia: { min: 0, max: 0.02 }, ph: { min: 6.5, max: 8.5 } },
  notes: '',
  sortOrder: 0,
  archivedAt: null,
  createdAt: '2026-01-01T00:00:00.000Z',
  updatedAt: '2026-01-01T00:00:00.000Z',
} as PublicTank

const scrolled = vi.fn()
beforeEach(() => {
  // jsdom does no layout: record the call instead.
  Element.prototype.scrollIntoView = scrolled
  scrolled.mockClear()
  vi.mocked(getTank).mockResolvedValue(tank)
  vi.mocked(getLatest).mockResolvedValue({ temperature: { value: 20, time: '2026-03-03T11:00:00.000Z', source: 'device' } })
  vi.mocked(createTestKitEntry).mockReset()
})

async function page() {
  const { wrapper } = await mountView(TestKitView, { role: 'keeper', props: { id: 12 } })
  await flushPromises()
  return wrapper
}

describe('TestKitView', () => {
  // The whole page, form, verdicts and explanations: slow to mount on a busy two-core machine.
  it("saves and explains the numbers, taking the temperature from the tank's latest reading", { timeout: 20_000 }, async () => {
    vi.mocked(createTestKitEntry).mockImplementation(async () => ({}) as never)
    const wrapper = await page()
    await wrapper.find('input[name="ammonia"]').setValue('2')
    await wrapper.find('input[name="ph"]').setValue('8.0')
    await wrapper.find('form').trigger('submit')
    await flushPromises()

    expect(createTestKitEntry).toHaveBeenCalledWith(
      12,
      expect.objectContaining({
        values: [
          { metric: 'ph', value: 8, unit: 'pH' },
          { metric: 'ammonia', value: 2, unit: 'mg/L' },
        ],
      }),
      'Quarantine A',
    )
    // 2 mg/L total at pH 8.0 and 20 °C is 3.82 % NH3 = 0.076 mg/L (Emerson et al. 1975 table; from memory).
    const ammonia = wrapper.find('[data-test="insight-ammonia"]').text()
    expect(ammonia).toContain('0.076 mg/L NH₃')
    expect(ammonia).toContain('20.0 °C (latest reading)')
    expect(wrapper.find('[data-test="kit-caution"]').exists()).toBe(true)
    expect((wrapper.find('input[name="ph"]').element as HTMLInputElement).value).toBe('')
    // Each value against the tank's band (0–0.02 mg/L ammonia is this fixture's, the trade's usual "zero", common practice).
    expect(wrapper.find('[data-test="verdict-ammonia"]').attributes('data-level')).toBe('act')
    expect(wrapper.find('[data-test="verdict-ammonia"] [data-test="verdict-summary"]').text()).toBe('2 mg/L: above the target band 0–0.02 mg/L.')
    expect(wrapper.find('[data-test="verdict-ph"]').attributes('data-level')).toBe('ok')
    expect(wrapper.find('[data-test="verdict-caution"]').text()).toContain('aquatic veterinarian')
    // The result is brought into view and takes the focus, for the phone whose save button sits below it.
    expect(scrolled).toHaveBeenCalledWith({ block: 'start' })
    expect(document.activeElement?.getAttribute('data-test')).toBe('kit-result')
  })

  it("puts the server's complaint on the right field", async () => {
    vi.mocked(createTestKitEntry).mockRejectedValue(
      new ApiError({
        status: 400,
        code: 'invalid_input',
        message: 'Check the values',
        fields: { 'values.1.value': 'nitrite 40 is above what this kit reads' },
      }),
    )
    const wrapper = await page()
    await wrapper.find('input[name="ph"]').setValue('7')
    await wrapper.find('input[name="nitrite"]').setValue('40')
    await wrapper.find('form').trigger('submit')
    await flushPromises()
    const messages = wrapper.find('input[name="nitrite"]').element.closest('.v-input')?.querySelector('.v-messages')?.textContent?.trim()
    expect(messages).toBe('nitrite 40 is above what this kit reads')
    expect(wrapper.find('[data-test="kit-insights"]').exists()).toBe(false)
  })
})
