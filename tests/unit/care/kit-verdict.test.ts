import { describe, expect, it } from 'vitest'
import { HEATER_HANDS_CAUTION, kitVerdicts } from '@shared/care/kit-verdict'
import { defaultTargetsFor } from '@shared/schemas/tank-defaults'

// The verdict compares each value with the tank's own band; the bands used here are the starting
// bands of a tropical freshwater tank (shared/schemas/tank-defaults.ts, `common practice`:
// ammonia and nitrite "read zero" once cycled, 0.02 mg/L being a typical kit's smallest step,
// see shared/care/cycling.ts). The advice table is `common practice` among keepers; the pH
// "about 0.2–0.3 a day" is `from memory`. Nothing here is a published threshold.
const tropical = defaultTargetsFor('tropical_freshwater')
const units = (metric: string) => ({ ammonia: 'mg/L', nitrite: 'mg/L', nitrate: 'mg/L', temperature: '°C', ph: '' })[metric] ?? ''

describe('test-kit verdicts against the tank’s target band', () => {
  it('flags 0.25 mg/L ammonia in an established tank whose band is 0–0.02 as act-today, with the usual steps', () => {
    const [ammonia] = kitVerdicts({ ammonia: 0.25 }, tropical, 'established', units)
    expect(ammonia).toMatchObject({ metric: 'ammonia', value: 0.25, band: { min: 0, max: 0.02 }, verdict: 'high', level: 'act' })
    expect(ammonia!.summary).toBe('0.25 mg/L: above the target band 0–0.02 mg/L.')
    expect(ammonia!.advice[0]).toMatch(/^Change 25–50 % of the water/)
    expect(ammonia!.advice.join(' ')).toContain('Do not replace all the filter media at once')
    expect(ammonia!.advice.at(-1)).toMatch(/^Retest/)
  })

  it('treats the edge of the band as inside, and a value just past it as outside', () => {
    expect(kitVerdicts({ ammonia: 0.02 }, tropical, 'established')[0]).toMatchObject({ verdict: 'in_band', level: 'ok', advice: [] })
    expect(kitVerdicts({ ammonia: 0.021 }, tropical, 'established')[0]).toMatchObject({ verdict: 'high', level: 'act' })
    expect(kitVerdicts({ ph: 6.5 }, tropical, 'established')[0]!.verdict).toBe('in_band')
    expect(kitVerdicts({ ph: 6.4 }, tropical, 'established')[0]).toMatchObject({ verdict: 'low', level: 'watch' })
  })

  it('softens ammonia and nitrite in a tank that is still cycling, and says why', () => {
    const [nitrite] = kitVerdicts({ nitrite: 0.5 }, tropical, 'cycling')
    expect(nitrite).toMatchObject({ verdict: 'high', level: 'watch' })
    expect(nitrite!.advice[0]).toMatch(/still cycling/)
    expect(kitVerdicts({ nitrite: 0.5 }, tropical, 'quarantine')[0]!.level).toBe('act')
  })

  it('gives one verdict per value in the order given, and says when a tank has no band for it', () => {
    const verdicts = kitVerdicts({ temperature: 25, nitrate: 60, kh: 4 }, tropical, 'established', units)
    expect(verdicts.map((v) => [v.metric, v.verdict])).toEqual([
      ['temperature', 'in_band'],
      ['nitrate', 'high'],
      ['kh', 'no_band'],
    ])
    expect(verdicts[2]!.summary).toBe('4: this tank has no target band for it.')
    expect(verdicts[1]!.advice.join(' ')).toContain('Test the tap water too')
  })

  it('adds the electrical caution to any heater advice', () => {
    const [cold] = kitVerdicts({ temperature: 21 }, tropical, 'established', units)
    expect(cold).toMatchObject({ verdict: 'low', level: 'watch' })
    expect(cold!.advice).toContain(HEATER_HANDS_CAUTION)
  })

  it('skips values that are missing or not numbers', () => {
    expect(kitVerdicts({ ph: Number.NaN, ammonia: undefined }, tropical, 'established')).toEqual([])
  })
})
