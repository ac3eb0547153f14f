import { describe, expect, it } from 'vitest'
import KitInsights from '@/components/testkit/KitInsights.vue'
import { GUIDANCE_CAUTION, kitInsights } from '@/components/testkit/insights'
import { mountView } from './mount'

describe('kitInsights', () => {
  it('works out un-ionised ammonia from the entry: 2 mg/L at pH 8.0, 20 °C → 3.82 % (Emerson et al. 1975 table; from memory)', () => {
    const { ammonia } = kitInsights({ ammonia: 2, ph: 8, temperature: 20 }, {})
    expect(ammonia.ok).toBe(true)
    if (!ammonia.ok) return
    expect(ammonia.result.percent).toBeCloseTo(3.82, 2)
    expect(ammonia.result.unionisedMgL).toBeCloseTo(0.0764, 3)
    expect(ammonia.used.map((u) => u.origin)).toEqual(['entry', 'entry', 'entry'])
  })

  it("falls back to the tank's latest pH and temperature, and says so", () => {
    const { ammonia } = kitInsights({ ammonia: 2 }, { ph: 7, temperature: 25 })
    expect(ammonia.ok && ammonia.used.map((u) => [u.metric, u.origin])).toEqual([
      ['ammonia', 'entry'],
      ['ph', 'latest'],
      ['temperature', 'latest'],
    ])
    // pH 7.0, 25 °C → 0.566 % (Emerson et al. 1975 table; from memory).
    expect(ammonia.ok && ammonia.result.percent).toBeCloseTo(0.566, 2)
  })

  it('says what is missing rather than guessing', () => {
    const insights = kitInsights({ ammonia: 0.5 }, {})
    expect(insights.ammonia).toEqual({ ok: false, reason: 'needs pH and temperature' })
    expect(insights.co2).toEqual({ ok: false, reason: 'needs pH and KH and temperature' })
    expect(insights.oxygen).toEqual({ ok: false, reason: 'needs temperature' })
  })

  it('gives the rule of thumb beside the computed CO2 (3 × KH × 10^(7 − pH), common practice)', () => {
    const { co2 } = kitInsights({ ph: 7, kh: 4, temperature: 25 }, {})
    expect(co2.ok && co2.result.ruleOfThumbMgL).toBe(12)
    expect(co2.ok && co2.result.mgL).toBeGreaterThan(12)
  })

  it('gives oxygen saturation at the temperature: 8.26 mg/L at 25 °C (ISO 5814:1990 solubility table)', () => {
    const { oxygen } = kitInsights({ temperature: 25, oxygen: 7.434 }, {})
    expect(oxygen.ok && oxygen.result.saturationMgL).toBeCloseTo(8.26, 2)
    // 7.434 mg/L is 90 % of 8.26.
    expect(oxygen.ok && oxygen.result.percent).toBeCloseTo(90, 0)
  })

  it('declines a temperature the formulas were not fitted for', () => {
    const { oxygen } = kitInsights({ temperature: 45 }, {})
    expect(oxygen.ok).toBe(false)
    expect(!oxygen.ok && oxygen.reason).toMatch(/^outside what the formula covers/)
  })
})

describe('KitInsights', () => {
  it('shows the figures with the caution', async () => {
    const { wrapper } = await mountView(KitInsights, { props: { insights: kitInsights({ ammonia: 2, ph: 8, temperature: 20 }, {}) } })
    expect(wrapper.find('[data-test="insight-ammonia"]').text()).toContain('0.076 mg/L NH₃')
    expect(wrapper.find('[data-test="insight-co2"]').text()).toContain('Not worked out: needs KH.')
    expect(wrapper.find('[data-test="kit-caution"]').text()).toBe(GUIDANCE_CAUTION)
    expect(GUIDANCE_CAUTION).toBe('These figures are guidance; confirm with your test kit and ask an aquatic veterinarian about sick fish.')
  })
})
