import { describe, expect, it } from 'vitest'
import { WATER_SPECIFIC_HEAT_KJ_PER_KG_K, waterDensityKgPerL } from '@shared/chemistry/water-properties'
import { expectWithin } from './helpers'

describe('waterDensityKgPerL (Kell 1975 fit)', () => {
  it.each([
    // CRC Handbook of Chemistry and Physics, 53rd ed., p. F-4, "Density of water" table (g/mL).
    [0, 0.999841, 'CRC Handbook 53rd ed. p. F-4'],
    [4, 0.999973, 'CRC Handbook 53rd ed. p. F-4'],
    [5, 0.999965, 'CRC Handbook 53rd ed. p. F-4'],
    [10, 0.9997, 'CRC Handbook 53rd ed. p. F-4'],
    [15, 0.999099, 'CRC Handbook 53rd ed. p. F-4'],
    // Same table, rows recalled — from memory.
    [20, 0.998203, 'CRC Handbook density table, from memory'],
    [25, 0.997044, 'CRC Handbook density table, from memory'],
  ])('%s °C → %s g/mL (%s)', (tempC, density) => {
    expectWithin(waterDensityKgPerL(tempC), density, 3e-6)
  })

  it('is densest near 4 °C', () => {
    expect(waterDensityKgPerL(4)).toBeGreaterThan(waterDensityKgPerL(0))
    expect(waterDensityKgPerL(4)).toBeGreaterThan(waterDensityKgPerL(8))
  })

  it.each([-1, 41, Number.POSITIVE_INFINITY])('rejects tempC %s', (tempC) => {
    expect(() => waterDensityKgPerL(tempC)).toThrow(/tempC/)
  })
})

describe('WATER_SPECIFIC_HEAT_KJ_PER_KG_K', () => {
  it('is 4.1813 kJ/(kg·K) at 25 °C (CRC Handbook / NIST; from memory)', () => {
    expectWithin(WATER_SPECIFIC_HEAT_KJ_PER_KG_K, 4.1813, 1e-4)
  })

  it('is within 0.1 % of the thermochemical calorie, 4.184 J per g·K (its historical definition)', () => {
    expectWithin(WATER_SPECIFIC_HEAT_KJ_PER_KG_K / 4.184, 1, 0.001)
  })
})
