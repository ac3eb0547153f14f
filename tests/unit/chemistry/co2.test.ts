import { describe, expect, it } from 'vitest'
import { MEQ_PER_L_PER_DKH, carbonicAcidPK1, co2FromPhKh, co2RuleOfThumb } from '@shared/chemistry/co2'
import { expectWithin } from './helpers'

describe('carbonicAcidPK1 (Plummer & Busenberg 1982)', () => {
  // Harned & Davis 1943, J. Am. Chem. Soc. 65:2030–2037, table of pK1 of carbonic acid —
  // from memory.
  it.each([
    [0, 6.579],
    [5, 6.517],
    [10, 6.464],
    [15, 6.419],
    [20, 6.381],
    [25, 6.352],
    [30, 6.327],
    [35, 6.309],
    [40, 6.298],
  ])('%s °C → %s (Harned & Davis 1943 table; from memory)', (tempC, pK1) => {
    expectWithin(carbonicAcidPK1(tempC), pK1, 0.003)
  })

  // Millero 1979, Geochim. Cosmochim. Acta 43:1651–1661, pure-water refit of Harned & Davis:
  // ln K1 = 290.9097 − 14554.21/T − 45.0575 ln T. An independent fit of the same measurements.
  it.each([0, 10, 20, 25, 30, 40])('%s °C agrees with the Millero 1979 refit within 0.002', (tempC) => {
    const t = tempC + 273.15
    const pK1Millero = -(290.9097 - 14554.21 / t - 45.0575 * Math.log(t)) / Math.LN10
    expectWithin(carbonicAcidPK1(tempC), pK1Millero, 0.002)
  })
})

describe('MEQ_PER_L_PER_DKH', () => {
  it('1 °dKH = 0.3566 meq/L (DIN definition 10 mg/L CaO = 17.848 mg/L CaCO3; from memory)', () => {
    expectWithin(MEQ_PER_L_PER_DKH, 0.3566, 0.0001)
  })
})

describe('co2FromPhKh', () => {
  // Hand-worked with pK1 = 6.352 at 25 °C (Harned & Davis 1943, from memory):
  // 0.35667 mmol/L × 10^(6.352 − 7) × 44.01 mg/mmol = 0.35667 × 0.22491 × 44.01 = 3.530 mg/L.
  it.each([
    [7.0, 1, 25, 3.53],
    // ten times the KH, ten times the CO2
    [7.0, 10, 25, 35.3],
    // one pH unit higher, one tenth
    [8.0, 10, 25, 3.53],
  ])('pH %s, %s °dKH, %s °C → %s mg/L (hand-worked)', (pH, kh, tempC, mgL) => {
    expectWithin(co2FromPhKh(pH, kh, tempC), mgL, 0.004 * mgL)
  })

  it('falls as the water warms at the same pH and KH (pK1 falls with temperature)', () => {
    expect(co2FromPhKh(7, 4, 28)).toBeLessThan(co2FromPhKh(7, 4, 20))
  })
})

describe('co2RuleOfThumb (common practice)', () => {
  it.each([
    [7.0, 1, 3],
    [6.5, 4, 37.947],
    [7.5, 6, 5.692],
  ])('pH %s, %s °dKH → %s mg/L', (pH, kh, mgL) => {
    expectWithin(co2RuleOfThumb(pH, kh), mgL, 0.001)
  })

  it.each([
    [6.6, 3],
    [7.0, 4],
    [7.4, 8],
  ])('reads lower than the 25 °C equilibrium at pH %s, %s °dKH', (pH, kh) => {
    const ratio = co2RuleOfThumb(pH, kh) / co2FromPhKh(pH, kh, 25)
    expect(ratio).toBeLessThan(1)
    // 3 / 3.530 from the hand-worked case above
    expectWithin(ratio, 0.85, 0.005)
  })
})

describe('input validation', () => {
  it.each([
    [() => co2FromPhKh(4.9, 4, 25), /pH/],
    [() => co2FromPhKh(9.1, 4, 25), /pH/],
    [() => co2FromPhKh(7, 0, 25), /kh/],
    [() => co2FromPhKh(7, -2, 25), /kh/],
    [() => co2FromPhKh(7, 4, 45), /tempC/],
    [() => co2RuleOfThumb(15, 4), /pH/],
    [() => carbonicAcidPK1(-5), /tempC/],
  ])('rejects out-of-range input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})
