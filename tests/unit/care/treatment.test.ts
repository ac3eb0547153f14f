import { describe, expect, it } from 'vitest'
import { courseEndsOn, courseNoteFor, courseState, courseTaskDrafts, doseForTank, doseWaterLitres, fractionLeftAfterWaterChange } from '@shared/care/treatment'

describe('treatment course arithmetic', () => {
  it('scales the label rate to the tank: 1 mL per 10 L in 180 L is 18 mL', () => {
    expect(doseForTank({ amount: 1, unit: 'mL', perLitres: 10 }, 180)).toBe(18)
    expect(doseForTank({ amount: 5, unit: 'drops', perLitres: 4 }, 60)).toBe(75)
    expect(() => doseForTank({ amount: 1, unit: 'mL', perLitres: 0 }, 60)).toThrow(RangeError)
  })

  it('takes the water from the dimensions at 90 % fill less the substrate (common practice), else the entered volume', () => {
    // 100 × 40 cm floor, 50 cm high: filled to 45 cm, 5 cm of substrate → 40 cm of water = 160 L.
    expect(
      doseWaterLitres({ dimensions: { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 }, substrateDepthCm: 5, volumeLitres: 200 }),
    ).toBeCloseTo(160, 9)
    expect(doseWaterLitres({ dimensions: null, substrateDepthCm: 0, volumeLitres: 75 })).toBe(75)
  })

  it('counts the days on the calendar, first day included', () => {
    expect(courseEndsOn('2026-12-05', 14)).toBe('2026-12-18')
    expect(courseEndsOn('2026-12-30', 3)).toBe('2027-01-01')
    const course = { startsOn: '2026-12-05', endsOn: '2026-12-18', stoppedAt: null }
    expect(courseState(course, '2026-12-04')).toEqual({ state: 'planned', day: null })
    expect(courseState(course, '2026-12-05')).toEqual({ state: 'running', day: 1 })
    expect(courseState(course, '2026-12-18')).toEqual({ state: 'running', day: 14 })
    expect(courseState(course, '2026-12-19')).toEqual({ state: 'finished', day: null })
    expect(courseState({ ...course, stoppedAt: '2026-12-06T10:00:00Z' }, '2026-12-07')).toEqual({ state: 'stopped', day: null })
  })

  // Mass balance with complete mixing: C_after = C_before × (V − v) / V.
  it('a water change of v litres from V leaves (V − v)/V of the medication', () => {
    expect(fractionLeftAfterWaterChange(180, 45)).toBe(0.75)
    expect(fractionLeftAfterWaterChange(100, 0)).toBe(1)
    expect(() => fractionLeftAfterWaterChange(100, 120)).toThrow(RangeError)
  })

  it('makes one dose task and one task per test and time of day, each daily', () => {
    const drafts = courseTaskDrafts({
      product: 'Copper treatment',
      dose: { amount: 1, unit: 'mL', perLitres: 10 },
      doseEveryDays: 2,
      tests: [
        { metric: 'copper', timesPerDay: 2, band: { min: 0.15, max: 0.2 } },
        { metric: 'ammonia', timesPerDay: 1, band: null },
      ],
      waterLitres: 120,
    })
    expect(drafts.map((d) => [d.kind, d.title, d.recurrence])).toEqual([
      ['treatment_dose', 'Dose Copper treatment: 12 mL for 120 L, as the label says', { kind: 'interval', everyDays: 2 }],
      ['treatment_test', 'Test copper (morning) during Copper treatment, label band 0.15–0.20 mg/L', { kind: 'interval', everyDays: 1 }],
      ['treatment_test', 'Test copper (evening) during Copper treatment, label band 0.15–0.20 mg/L', { kind: 'interval', everyDays: 1 }],
      ['treatment_test', 'Test ammonia during Copper treatment', { kind: 'interval', everyDays: 1 }],
    ])
    expect(drafts[0]!.defaultValues).toEqual({ product: 'Copper treatment', amount: 12, unit: 'mL' })
  })

  it('notes carbon and water changes during a course, nothing else', () => {
    const courses = [{ product: 'Copper treatment', endsOn: '2026-12-18' }]
    expect(courseNoteFor({ kind: 'media_replace', title: 'Replace filter media', defaultValues: {} }, courses)).toMatch(
      /^Activated carbon removes most medications/,
    )
    expect(courseNoteFor({ kind: 'other', title: 'Fresh carbon in the canister', defaultValues: {} }, courses)).toMatch(/until 2026-12-18/)
    expect(courseNoteFor({ kind: 'water_change', title: 'Partial water change', defaultValues: { percent: 25 } }, courses)).toBe(
      'A water change dilutes Copper treatment: this 25 % change leaves 75 % of it in the water; follow the label on whether to dose the new water.',
    )
    expect(courseNoteFor({ kind: 'glass_clean', title: 'Clean the glass', defaultValues: {} }, courses)).toBeNull()
    expect(courseNoteFor({ kind: 'media_replace', title: 'Replace filter media', defaultValues: {} }, [])).toBeNull()
  })
})
