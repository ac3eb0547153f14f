import { describe, expect, it } from 'vitest'
import { oxygenSolubilityMgL, percentSaturation } from '@shared/chemistry/oxygen'
import { expectWithin } from './helpers'

// ISO 5814:1990 (EN 25814), Water quality — Determination of dissolved oxygen —
// Electrochemical probe method, table of oxygen solubility in water in equilibrium with air at
// 101.325 kPa. Values are rounded, so the tolerance is half a unit of the last printed digit.
const iso5814Table: [tempC: number, mgL: number, tolerance: number][] = [
  [0, 14.6, 0.05],
  [5, 12.8, 0.05],
  [10, 11.3, 0.05],
  [15, 10.1, 0.05],
  [18, 9.47, 0.005],
  [20, 9.09, 0.005],
  [22, 8.74, 0.005],
  [24, 8.42, 0.005],
  [25, 8.26, 0.005],
  [26, 8.11, 0.005],
  [28, 7.83, 0.005],
  [30, 7.56, 0.005],
]

// USGS DOTABLES / Standard Methods 4500-O Table 4500-O:I at 1 atm, three decimals — from memory.
const dotablesFromMemory: [tempC: number, mgL: number][] = [
  [0, 14.621],
  [20, 9.092],
  [25, 8.263],
  [40, 6.413],
]

// Saturation vapour pressure of water, CRC Handbook "Vapor Pressure of Water" table — from memory.
const vapourPressureKPaFromMemory: [tempC: number, kPa: number][] = [
  [20, 2.3393],
  [25, 3.1699],
]

describe('oxygenSolubilityMgL at 1 atm', () => {
  it.each(iso5814Table)('%s °C → %s mg/L (ISO 5814:1990 solubility table)', (tempC, mgL, tolerance) => {
    expectWithin(oxygenSolubilityMgL(tempC), mgL, tolerance)
  })

  it.each(dotablesFromMemory)('%s °C → %s mg/L (USGS DOTABLES, Standard Methods 4500-O; from memory)', (tempC, mgL) => {
    expectWithin(oxygenSolubilityMgL(tempC), mgL, 0.0015)
  })

  it('uses 101.325 kPa when no pressure is given', () => {
    expect(oxygenSolubilityMgL(25)).toBe(oxygenSolubilityMgL(25, 101.325))
  })
})

describe('oxygenSolubilityMgL pressure correction', () => {
  // Dalton's law: dissolved O2 follows the dry-air partial pressure (P − p_w); the θ term of
  // Benson & Krause shifts it by well under 0.1 %. p_w from the CRC table above (from memory).
  it.each(vapourPressureKPaFromMemory)('at %s °C scales with (P − p_w), p_w = %s kPa', (tempC, pw) => {
    const ratio = oxygenSolubilityMgL(tempC, 90) / oxygenSolubilityMgL(tempC)
    const expected = (90 - pw) / (101.325 - pw)
    expectWithin(ratio, expected, 0.0005)
  })

  it('is lower at altitude than at sea level', () => {
    expect(oxygenSolubilityMgL(25, 85)).toBeLessThan(oxygenSolubilityMgL(25, 101.325))
  })
})

describe('percentSaturation', () => {
  it.each([
    // ISO 5814:1990 table: 8.26 mg/L at 25 °C is saturation, 9.09 mg/L at 20 °C likewise.
    [8.26, 25, 100],
    [4.13, 25, 50],
    [9.09, 20, 100],
  ])('%s mg/L at %s °C ≈ %s %% (ISO 5814:1990 table)', (mgL, tempC, percent) => {
    expectWithin(percentSaturation(mgL, tempC), percent, 0.1)
  })
})

describe('input validation', () => {
  it.each([
    [() => oxygenSolubilityMgL(-0.5), /tempC/],
    [() => oxygenSolubilityMgL(40.5), /tempC/],
    [() => oxygenSolubilityMgL(Number.NaN), /tempC/],
    [() => oxygenSolubilityMgL(25, 40), /pressureKPa/],
    [() => oxygenSolubilityMgL(25, 120), /pressureKPa/],
    [() => percentSaturation(-1, 25), /measuredMgL/],
    [() => percentSaturation(8, 45), /tempC/],
  ])('rejects out-of-range input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})
