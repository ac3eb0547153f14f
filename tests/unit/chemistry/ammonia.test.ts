import { describe, expect, it } from 'vitest'
import { ammoniumPKa, unionisedAmmoniaFraction, unionisedAmmoniaMgL } from '@shared/chemistry/ammonia'
import { expectRelative, expectWithin } from './helpers'

describe('unionisedAmmoniaFraction', () => {
  // Emerson, Russo, Lund & Thurston 1975, J. Fish. Res. Board Can. 32:2379–2383, table of
  // percent NH3 in fresh water — from memory.
  // Tolerance: half a unit of the last printed digit.
  it.each([
    [7.0, 25, 0.566, 0.0005],
    [8.0, 20, 3.82, 0.005],
  ])('pH %s, %s °C → %s %% (Emerson et al. 1975 table; from memory)', (pH, tempC, percent, tolerance) => {
    expectWithin(100 * unionisedAmmoniaFraction(pH, tempC), percent, tolerance)
  })

  // Trussell 1972, "The percent un-ionized ammonia in aqueous ammonia solutions at different pH
  // levels and temperatures", J. Fish. Res. Board Can. 29:1505–1507, Table 1 (fresh water).
  // Trussell used older pKa data; Emerson et al. agree with it within 3 %.
  it.each([
    [7.0, 10, 0.19],
    [8.0, 10, 1.83],
    [8.5, 10, 5.55],
    [7.0, 15, 0.27],
    [8.0, 15, 2.65],
    [8.5, 15, 7.98],
    [7.0, 20, 0.4],
    [8.0, 20, 3.83],
    [8.5, 20, 11.18],
    [7.0, 25, 0.55],
    [7.5, 25, 1.73],
    [8.0, 25, 5.28],
    [8.5, 25, 14.97],
  ])('pH %s, %s °C → %s %% within 3 %% (Trussell 1972 Table 1)', (pH, tempC, percent) => {
    expectRelative(100 * unionisedAmmoniaFraction(pH, tempC), percent, 0.03)
  })

  // aqion, "Free Ammonia in Water" worked example (full speciation model): pH 8.5, 15 °C,
  // 0.03 mM total ammonia gives 0.00238 mM NH3 = 7.93 %.
  it('matches a full speciation model within 1 % (aqion "Free Ammonia in Water" example)', () => {
    expectRelative(unionisedAmmoniaFraction(8.5, 15), 0.00238 / 0.03, 0.01)
  })

  it('rises with pH and with temperature', () => {
    expect(unionisedAmmoniaFraction(8, 25)).toBeGreaterThan(unionisedAmmoniaFraction(7, 25))
    expect(unionisedAmmoniaFraction(8, 28)).toBeGreaterThan(unionisedAmmoniaFraction(8, 22))
  })
})

describe('ammoniumPKa', () => {
  it('is 9.245 at 25 °C (Bates & Pinching 1949, J. Res. NBS 42:419; from memory)', () => {
    expectWithin(ammoniumPKa(25), 9.245, 0.002)
  })
})

describe('unionisedAmmoniaMgL', () => {
  it('2 mg/L total at pH 8.0, 20 °C → 0.0764 mg/L NH3 (3.82 %, Emerson et al. 1975; from memory)', () => {
    expectWithin(unionisedAmmoniaMgL(2, 8, 20), 0.0764, 0.0004)
  })

  it('is zero when there is no ammonia', () => {
    expect(unionisedAmmoniaMgL(0, 8, 25)).toBe(0)
  })
})

describe('input validation', () => {
  it.each([
    [() => unionisedAmmoniaFraction(-0.1, 25), /pH/],
    [() => unionisedAmmoniaFraction(14.1, 25), /pH/],
    [() => unionisedAmmoniaFraction(7, -1), /tempC/],
    [() => unionisedAmmoniaFraction(7, 41), /tempC/],
    [() => unionisedAmmoniaMgL(-0.5, 7, 25), /totalAmmoniaMgL/],
  ])('rejects out-of-range input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})
