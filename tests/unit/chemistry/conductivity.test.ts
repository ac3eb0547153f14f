import { describe, expect, it } from 'vitest'
import { compensateTo25C, tdsFromConductivity } from '@shared/chemistry/conductivity'
import { expectRelative, expectWithin } from './helpers'

describe('compensateTo25C', () => {
  // CRC Handbook of Chemistry and Physics, "Standard KCl solutions for calibrating conductivity
  // cells" (Wu, Koch & Pratt 1991, J. Res. NIST 96:191), 0.01 mol/kg KCl; 1408.23 µS/cm at 25 °C.
  // The linear α = 0.0191 model brings these back to the 25 °C value within 0.7 %.
  it.each([
    [15, 1141.45],
    [18, 1219.93],
    [20, 1273.03],
    [30, 1546.63],
    [35, 1687.79],
  ])('0.01 mol/kg KCl at %s °C (%s µS/cm) → 1408.23 µS/cm (CRC Handbook KCl table)', (tempC, measured) => {
    expectRelative(compensateTo25C(measured, tempC), 1408.23, 0.007)
  })

  // US EPA Method 120.1 (1982), cell-calibration table for 0.01 M KCl; 1413 µS/cm at 25 °C.
  it.each([
    [21, 1305],
    [22, 1332],
    [23, 1359],
    [24, 1386],
    [26, 1441],
  ])('0.01 M KCl at %s °C (%s µS/cm) → 1413 µS/cm (EPA Method 120.1 table)', (tempC, measured) => {
    expectRelative(compensateTo25C(measured, tempC), 1413, 0.002)
  })

  it('leaves a 25 °C reading unchanged and accepts another α', () => {
    expect(compensateTo25C(500, 25)).toBe(500)
    // 1 + 0.02 × (20 − 25) = 0.9 → 450 / 0.9
    expectWithin(compensateTo25C(450, 20, 0.02), 500, 1e-9)
  })
})

describe('tdsFromConductivity (Standard Methods 1030 E factor 0.55–0.7; from memory)', () => {
  it.each([
    [1000, undefined, 650],
    [1000, 0.55, 550],
    [400, 0.7, 280],
  ])('%s µS/cm × %s → %s mg/L', (uScm, factor, tds) => {
    expectWithin(tdsFromConductivity(uScm, factor), tds, 1e-9)
  })
})

describe('input validation', () => {
  it.each([
    [() => compensateTo25C(-1, 25), /conductivityUsCm/],
    [() => compensateTo25C(500, 41), /tempC/],
    [() => compensateTo25C(500, 20, 0), /alpha/],
    [() => tdsFromConductivity(-3), /uScm25/],
    [() => tdsFromConductivity(500, 0.5), /factor/],
    [() => tdsFromConductivity(500, 0.75), /factor/],
  ])('rejects out-of-range input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})
