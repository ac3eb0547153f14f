import { describe, expect, it } from 'vitest'
import { acclimationPlan, mixPh, mixTemperature } from '@shared/care/acclimation'

// Temperature of a mix: the heat balance m₁c(T − T₁) = m₂c(T₂ − T) for two lots of the same
// water, i.e. the mass-weighted mean (any introductory physics text, e.g. Halliday, Resnick &
// Walker, Fundamentals of Physics, chapter "Temperature, Heat, and the First Law of
// Thermodynamics" — chapter title `from memory`). Equal density is assumed, so volume stands in for mass.
// pH: pH = −log₁₀ a(H⁺) (IUPAC Compendium of Chemical Terminology, "pH"); averaging [H⁺] by
// volume ignores buffering, which the product says, so the checks below are of the arithmetic
// the product promises, worked by hand.
// The schedule (an addition every 5–10 min over about 30 min) is `common practice`.
describe('mixing estimates', () => {
  it('weights temperature by volume', () => {
    expect(mixTemperature(1, 22, 1, 26)).toBe(24)
    expect(mixTemperature(3, 20, 1, 28)).toBe(22)
  })

  it('mixes pH through hydrogen-ion concentration, not the pH numbers', () => {
    // (10⁻⁶ + 10⁻⁸) / 2 = 5.05 × 10⁻⁷ mol/L → pH 6.2967, not the naive 7.
    expect(mixPh(1, 6, 1, 8)).toBeCloseTo(6.2967, 4)
    expect(mixPh(2, 7.2, 5, 7.2)).toBeCloseTo(7.2, 10)
  })
})

describe('acclimation plan', () => {
  it('adds a sixth of the bag every 5 minutes and nets the animals at 30 minutes', () => {
    const plan = acclimationPlan({ bagLitres: 1.2, bagTempC: 22, bagPh: 7.8, tankTempC: 26, tankPh: 7 })
    expect(plan.steps.map((s) => s.minute)).toEqual([0, 5, 10, 15, 20, 25])
    expect(plan.netAtMinute).toBe(30)
    expect(plan.steps[0]?.addLitres).toBeCloseTo(0.2, 10)
    expect(plan.steps.at(-1)?.totalLitres).toBeCloseTo(2.4, 10)
    // Step by step it warms: 1.2 L at 22 °C plus 0.2 L at 26 °C → (26.4 + 5.2) / 1.4 = 22.571 °C.
    expect(plan.steps[0]?.estimatedTempC).toBeCloseTo(22.5714, 4)
    // After all six additions it is one part bag to one part tank water: 24 °C, and
    // pH −log₁₀((10^−7.8 + 10^−7) / 2) = 7.2371 (worked by hand).
    expect(plan.steps.at(-1)?.estimatedTempC).toBeCloseTo(24, 10)
    expect(plan.steps.at(-1)?.estimatedPh).toBeCloseTo(7.2371, 4)
    expect(plan.note).toMatch(/rough guide/)
  })

  it('spaces additions every 10 minutes when asked', () => {
    const plan = acclimationPlan({ bagLitres: 0.9, intervalMinutes: 10 })
    expect(plan.steps.map((s) => [s.minute, s.addLitres])).toEqual([
      [0, 0.3],
      [10, 0.3],
      [20, 0.3],
    ])
    expect(plan.steps[0]?.estimatedTempC).toBeNull()
  })

  it('gives shares of the bag when its volume is unknown, still estimating from the temperatures', () => {
    const plan = acclimationPlan({ bagTempC: 22, tankTempC: 26 })
    expect(plan.steps[0]).toMatchObject({ addLitres: null, totalLitres: null })
    expect(plan.steps[0]?.addFractionOfBag).toBeCloseTo(1 / 6, 10)
    expect(plan.steps.at(-1)?.estimatedTempC).toBeCloseTo(24, 10)
  })

  it('refuses intervals outside 5–10 minutes and an empty bag', () => {
    expect(() => acclimationPlan({ bagLitres: 1, intervalMinutes: 4 })).toThrow(RangeError)
    expect(() => acclimationPlan({ bagLitres: 0 })).toThrow(/bagLitres/)
  })
})
