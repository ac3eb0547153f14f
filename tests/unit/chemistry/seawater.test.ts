import { describe, expect, it } from 'vitest'
import { conductivityFromSalinity, practicalSalinity, salinityFromConductivity, STANDARD_SEAWATER_MS_CM, T68_PER_T90 } from '@shared/chemistry/salinity'
import { pureWaterDensity, salinityFromSpecificGravity, seawaterDensity, specificGravity, specificGravityAtReference } from '@shared/chemistry/seawater-density'
import { expectWithin } from './helpers'

// UNESCO 44's tables are on the IPTS-68 scale; our functions take ITS-90, so the checks convert.
const fromT68 = (t68: number) => t68 / T68_PER_T90

describe('practicalSalinity (PSS-78)', () => {
  // Fofonoff & Millard 1983, UNESCO Technical Papers in Marine Science 44, check value p. 9:
  // R = 1.888091, T68 = 40 °C, p = 10000 dbar → S = 40.0000.
  it('R 1.888091 at 40 °C and 10000 dbar is 40.0000 (UNESCO 44 check value)', () => {
    expectWithin(practicalSalinity(1.888091, fromT68(40), 10000), 40.0, 0.00005)
  })

  // UNESCO 44 p. 9 (as quoted in the Moss Landing Marine Laboratories routines): R 0.65, 5 °C, 1500 dbar → 27.9953479.
  it('R 0.65 at 5 °C and 1500 dbar is 27.99535 (UNESCO 44)', () => {
    expectWithin(practicalSalinity(0.65, fromT68(5), 1500), 27.99535, 0.00002)
  })

  // The scale's definition (Lewis & Perkin 1981; UNESCO 44 eq. 1): seawater with the conductivity of
  // the standard KCl solution at 15 °C and one atmosphere has practical salinity 35.
  it('R 1 at 15 °C and the surface is 35 by definition', () => {
    expectWithin(practicalSalinity(1, fromT68(15), 0), 35, 0.00001)
  })

  it('a probe reading of 42 914 µS/cm at 15 °C (C(35,15,0) = 42.914 mS/cm, UNESCO 44) is 35', () => {
    expectWithin(salinityFromConductivity(STANDARD_SEAWATER_MS_CM * 1000, fromT68(15)), 35, 0.00001)
  })

  it('conductivityFromSalinity inverts it at a tank temperature', () => {
    const uScm = conductivityFromSalinity(35, 25)
    expectWithin(salinityFromConductivity(uScm, 25), 35, 1e-6)
    // about 53 mS/cm at 25 °C for salinity 35 (UNESCO 44 table of rt; from memory: "53.1 mS/cm")
    expectWithin(uScm / 1000, 53.1, 0.2)
  })

  it('refuses temperatures outside the fit and negative ratios', () => {
    expect(() => practicalSalinity(-0.1, 25)).toThrow(RangeError)
    expect(() => practicalSalinity(1, 45)).toThrow(/tempC/)
  })
})

describe('seawaterDensity (EOS-80, one atmosphere)', () => {
  // Millero & Poisson 1981 / UNESCO 44 check values (IPTS-68 temperatures).
  it.each([
    [35, 25, 1023.34306],
    [35, 5, 1027.67547],
    [0, 5, 999.96675],
  ])('S %s at %s °C is %s kg/m³ (UNESCO 44 check value)', (s, t68, rho) => {
    expectWithin(seawaterDensity(s, fromT68(t68)), rho, 0.00001)
  })

  // Pure water at 25 °C, 997.047 kg/m³ (Tanaka et al. 2001, Metrologia 38; from memory); SMOW in EOS-80 agrees within 0.002.
  it('pure water at 25 °C is 997.047 kg/m³', () => {
    expectWithin(pureWaterDensity(25), 997.047, 0.002)
  })

  it('refuses salinity above the fit', () => {
    expect(() => seawaterDensity(50, 25)).toThrow(/salinity/)
  })
})

describe('specific gravity and its inverse', () => {
  // Derived from the two UNESCO 44 densities above: 1023.343 / 997.047 = 1.02637.
  it('S 35 at 25/25 °C is 1.0264 (common practice: "35 ppt reads 1.026 on a hydrometer")', () => {
    expectWithin(specificGravity(35, 25), 1.02637, 0.00002)
  })

  it.each([
    [1.0264, 25, 35.04],
    [1.0085, 25, 11.29],
  ])('SG %s read at %s °C is salinity %s (inverted EOS-80)', (sg, t, s) => {
    expectWithin(salinityFromSpecificGravity(sg, t), s, 0.01)
  })

  it('a reading at one temperature comes back to the same salinity at another', () => {
    for (const [s, t] of [
      [35, 20],
      [8, 28],
      [30, 15],
    ]) {
      expectWithin(salinityFromSpecificGravity(specificGravity(s, t), t), s, 1e-6)
      expectWithin(specificGravityAtReference(specificGravity(s, t), t), specificGravity(s, 25), 1e-9)
    }
  })

  it('t/t specific gravity hardly moves with temperature: 1.0250 at 28/28 °C is 1.0251 at 25/25 °C', () => {
    expectWithin(specificGravityAtReference(1.025, 28), 1.0251, 0.00005)
  })

  it('a hydrometer for 25 °C in 28 °C water reads light: 1.0250 is 1.0259 at 25/25 °C', () => {
    expectWithin(specificGravity(salinityFromSpecificGravity(1.025, 28, 25), 25), 1.0259, 0.0001)
  })

  it('refuses a reading no salinity of the fit gives', () => {
    expect(() => salinityFromSpecificGravity(1.06, 25)).toThrow(RangeError)
    expect(() => salinityFromSpecificGravity(0.98, 25)).toThrow(RangeError)
  })
})
