import { describe, expect, it } from 'vitest'
import {
  HEATER_ALREADY_EXPOSED_CAUTION,
  HEATER_OFF_CAUTION,
  LARGE_CHANGE_CAUTION,
  UNPLUG_CAUTION,
  doseForVolume,
  planWaterChange,
  temperatureMismatchAdvice,
  type WaterChangeInput,
} from '@shared/chemistry/water-change'
import type { TankShape } from '@shared/chemistry/volume'
import { expectWithin } from './helpers'

// Hand-worked tank: 100 × 40 cm floor = 4000 cm², i.e. 4 L per cm of level.
// Filled to 45 cm over 5 cm of substrate → 40 cm × 4 L = 160 L of water.
const tank: TankShape = { shape: 'rectangular', lengthCm: 100, widthCm: 40, heightCm: 50 }
const base = { shape: tank, fillHeightCm: 45, substrateDepthCm: 5 }

describe('planWaterChange (hand-worked geometry)', () => {
  it.each<[string, WaterChangeInput, { litresOut: number; percent: number; levelAfterCm: number; exposed: boolean; maxL: number; maxPct: number }]>([
    // 25 % of 160 L = 40 L = 10 cm; heater top at 38 cm is above 35 cm; covered until 45 − 38 = 7 cm = 28 L.
    [
      '25 % with heater top at 38 cm',
      { ...base, heaterTopCm: 38, percent: 25 },
      { litresOut: 40, percent: 25, levelAfterCm: 35, exposed: true, maxL: 28, maxPct: 17.5 },
    ],
    // 40 L again, heater top at 30 cm stays 5 cm under; 15 cm × 4 L = 60 L = 37.5 %.
    [
      '25 % with heater top at 30 cm',
      { ...base, heaterTopCm: 30, percent: 25 },
      { litresOut: 40, percent: 25, levelAfterCm: 35, exposed: false, maxL: 60, maxPct: 37.5 },
    ],
    // 20 L = 5 cm = 12.5 %.
    ['20 L by volume', { ...base, heaterTopCm: 38, litres: 20 }, { litresOut: 20, percent: 12.5, levelAfterCm: 40, exposed: false, maxL: 28, maxPct: 17.5 }],
    // A heater lying in the substrate can never be uncovered by draining.
    [
      'heater below the substrate surface',
      { ...base, heaterTopCm: 3, percent: 90 },
      { litresOut: 144, percent: 90, levelAfterCm: 9, exposed: false, maxL: 160, maxPct: 100 },
    ],
    // Without a heater position the whole water column is available.
    ['no heater given', { ...base, percent: 10 }, { litresOut: 16, percent: 10, levelAfterCm: 41, exposed: false, maxL: 160, maxPct: 100 }],
  ])('%s', (_label, input, want) => {
    const plan = planWaterChange(input)
    expectWithin(plan.litresOut, want.litresOut, 1e-9)
    expectWithin(plan.percent, want.percent, 1e-9)
    expectWithin(plan.levelAfterCm, want.levelAfterCm, 1e-9)
    expect(plan.heaterExposed).toBe(want.exposed)
    expectWithin(plan.maxLitresKeepingHeaterCovered, want.maxL, 1e-9)
    expectWithin(plan.maxPercentKeepingHeaterCovered, want.maxPct, 1e-9)
    expect(plan.cautions.includes(HEATER_OFF_CAUTION)).toBe(want.exposed)
  })

  it('names the heater step exactly when the heater would be exposed (common practice)', () => {
    const plan = planWaterChange({ ...base, heaterTopCm: 38, percent: 25 })
    expect(plan.cautions).toContain('Switch the heater off about 30 minutes before draining and back on only once it is covered again')
  })

  it('always reminds to unplug, flags large changes and a heater already out of water', () => {
    expect(planWaterChange({ ...base, percent: 10 }).cautions).toEqual([UNPLUG_CAUTION])
    expect(planWaterChange({ ...base, percent: 60 }).cautions).toContain(LARGE_CHANGE_CAUTION)
    const dry = planWaterChange({ ...base, heaterTopCm: 47, percent: 10 })
    expect(dry.cautions).toContain(HEATER_ALREADY_EXPOSED_CAUTION)
    expect(dry.maxLitresKeepingHeaterCovered).toBe(0)
    expect(dry.heaterExposed).toBe(true)
  })

  it.each([
    [{ ...base, percent: 0 }, /percent/],
    [{ ...base, percent: 101 }, /percent/],
    [{ ...base, litres: -5 }, /litres/],
    [{ ...base, litres: 161 }, /litres/],
    [{ ...base, heaterTopCm: -1, percent: 10 }, /heaterTopCm/],
    [{ ...base, percent: 10, litres: 5 } as unknown as WaterChangeInput, /percent or litres/],
    [{ ...base } as unknown as WaterChangeInput, /percent or litres/],
    [{ ...base, fillHeightCm: 55, percent: 10 }, /fillHeightCm/],
  ])('rejects bad input %#', (input, name) => {
    expect(() => planWaterChange(input as WaterChangeInput)).toThrow(RangeError)
    expect(() => planWaterChange(input as WaterChangeInput)).toThrow(name)
  })
})

describe('doseForVolume (arithmetic on a label rate)', () => {
  it.each([
    [160, { amount: 5, unit: 'mL', per: '10L' }, 80, 'mL'],
    [25, { amount: 2, unit: 'drops', per: 'L' }, 50, 'drops'],
    [45, { amount: 1.5, unit: 'g', per: '10L' }, 6.75, 'g'],
  ] as const)('%s L at %j → %s %s', (litres, rate, amount, unit) => {
    const dose = doseForVolume(litres, rate)
    expectWithin(dose.amount, amount, 1e-9)
    expect(dose.unit).toBe(unit)
  })

  it('rejects zero or negative litres and label amounts, and unknown label volumes', () => {
    expect(() => doseForVolume(0, { amount: 1, unit: 'mL', per: 'L' })).toThrow(/litres/)
    expect(() => doseForVolume(10, { amount: -1, unit: 'mL', per: 'L' })).toThrow(/labelRate.amount/)
    expect(() => doseForVolume(10, { amount: 1, unit: 'mL', per: 'gal' as 'L' })).toThrow(/labelRate.per/)
  })
})

describe('temperatureMismatchAdvice (thresholds are common practice)', () => {
  it.each([
    [25, 25, 'ok'],
    [25, 25.8, 'ok'],
    [25, 24, 'ok'],
    [25, 23.5, 'caution'],
    [25, 27, 'caution'],
    [25, 27.5, 'warning'],
    [26, 20, 'warning'],
  ] as const)('tank %s °C, new water %s °C → %s', (tankC, newC, level) => {
    const advice = temperatureMismatchAdvice(tankC, newC)
    expect(advice.level).toBe(level)
    expectWithin(advice.differenceK, newC - tankC, 1e-9)
  })

  it('says which way the new water is off', () => {
    expect(temperatureMismatchAdvice(25, 22).message).toContain('colder')
    expect(temperatureMismatchAdvice(25, 26.5).message).toContain('warmer')
  })

  it('rejects temperatures outside 0–40 °C', () => {
    expect(() => temperatureMismatchAdvice(-2, 25)).toThrow(/tankC/)
    expect(() => temperatureMismatchAdvice(25, 45)).toThrow(/newWaterC/)
  })
})
