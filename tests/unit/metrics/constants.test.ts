import { describe, expect, it } from 'vitest'
import {
  ATOMIC_WEIGHT,
  CACO3_MG_PER_L_PER_GERMAN_DEGREE,
  CAO_MG_PER_L_PER_GERMAN_DEGREE,
  MMOL_PER_L_PER_GERMAN_DEGREE,
  MOLAR_MASS,
  NH3_PER_NH3_N,
  NO2_PER_NO2_N,
  NO3_PER_NO3_N,
} from '@shared/metrics'

// Source for the atomic weights: Prohaska T. et al., "Standard atomic weights of the elements 2021
// (IUPAC Technical Report)", Pure Appl. Chem. 94 (2022), abridged values table.
// Molar masses below are worked by hand from those values; the code derives them separately.
describe('atomic weights and molar masses', () => {
  it('uses the IUPAC 2021 abridged atomic weights', () => {
    expect(ATOMIC_WEIGHT).toEqual({ H: 1.008, C: 12.011, N: 14.007, O: 15.999, Ca: 40.078, Mg: 24.305, P: 30.973762 })
  })

  it.each([
    ['NH3', 17.031], // 14.007 + 3 × 1.008
    ['NO2', 46.005], // 14.007 + 2 × 15.999
    ['NO3', 62.004], // 14.007 + 3 × 15.999
    ['CaO', 56.077], // 40.078 + 15.999
    ['CaCO3', 100.086], // 40.078 + 12.011 + 3 × 15.999
  ] as const)('M(%s) = %d g/mol', (formula, grams) => {
    expect(MOLAR_MASS[formula]).toBeCloseTo(grams, 9)
  })
})

describe('"as N" factors', () => {
  // Hach Support, "What is the factor to convert from NO3-N and NO3?", document TE387 v2.0
  // (2017): multiply NO3-N by 4.427. Also 62.004 / 14.007 = 4.4267 from IUPAC 2021.
  it('NO3-N → NO3 is 4.427', () => {
    expect(NO3_PER_NO3_N).toBeCloseTo(4.427, 3)
  })

  // IUPAC 2021 abridged atomic weights: 46.005 / 14.007 = 3.2844.
  it('NO2-N → NO2 is 3.284', () => {
    expect(NO2_PER_NO2_N).toBeCloseTo(3.284, 3)
  })

  // IUPAC 2021 abridged atomic weights: 17.031 / 14.007 = 1.2159.
  it('NH3-N → NH3 is 1.216', () => {
    expect(NH3_PER_NH3_N).toBeCloseTo(1.216, 3)
  })
})

describe('German degree of hardness', () => {
  // Internetchemie ChemLin, "Deutscher Härtegrad" (2016): 1 °dH is defined as 10 mg CaO per litre.
  it('is defined as 10 mg/L CaO', () => {
    expect(CAO_MG_PER_L_PER_GERMAN_DEGREE).toBe(10)
  })

  // 10 × M(CaCO3) / M(CaO) = 10 × 100.086 / 56.077 = 17.848 (IUPAC 2021 atomic weights);
  // ChemLin "Deutscher Härtegrad" (2016) prints the same value rounded: 17.8 mg/L CaCO3.
  it('is 17.848 mg/L CaCO3', () => {
    expect(CACO3_MG_PER_L_PER_GERMAN_DEGREE).toBeCloseTo(17.848, 3)
  })

  // ChemLin "Deutscher Härtegrad" (2016): 1 °dH = 0.1783 mmol/L (10 / 56.077 = 0.17833).
  it('is 0.1783 mmol/L', () => {
    expect(MMOL_PER_L_PER_GERMAN_DEGREE).toBeCloseTo(0.1783, 4)
  })

  // The two alternative scales must agree with each other: 1 mmol/L CaCO3 = 100.09 mg/L
  // (M(CaCO3) = 100.086 g/mol, IUPAC 2021).
  it('makes 1 mmol/L equal to 100.09 mg/L CaCO3', () => {
    const mgPerMmol = CACO3_MG_PER_L_PER_GERMAN_DEGREE / MMOL_PER_L_PER_GERMAN_DEGREE
    expect(mgPerMmol).toBeCloseTo(100.09, 2)
  })
})
