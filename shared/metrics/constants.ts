// Conversion constants derived from atomic weights rather than typed-in ratios, so every factor
// traces back to one published table and stays consistent with the others.

/** IUPAC abridged standard atomic weights (CIAAW, Standard atomic weights of the elements 2021). */
export const ATOMIC_WEIGHT = {
  H: 1.008,
  C: 12.011,
  N: 14.007,
  O: 15.999,
  Ca: 40.078,
  Mg: 24.305,
  P: 30.973762,
} as const

const { H, C, N, O, Ca, Mg, P } = ATOMIC_WEIGHT

/** Molar masses in g/mol. */
export const MOLAR_MASS = {
  N,
  NH3: N + 3 * H,
  NH4: N + 4 * H,
  NO2: N + 2 * O,
  NO3: N + 3 * O,
  CaO: Ca + O,
  CaCO3: Ca + C + 3 * O,
  Ca,
  Mg,
  P,
  PO4: P + 4 * O,
} as const

/** mg/L of the ion per mg/L expressed as nitrogen ("-N" test-kit scales). */
export const NH3_PER_NH3_N = MOLAR_MASS.NH3 / MOLAR_MASS.N
export const NO2_PER_NO2_N = MOLAR_MASS.NO2 / MOLAR_MASS.N
export const NO3_PER_NO3_N = MOLAR_MASS.NO3 / MOLAR_MASS.N

/**
 * Total ammonia as NH3 per mg/L of it written as NH4+: kits that report ammonium measure the same
 * total (NH3 + NH4+), counted in ammonium's mass, so the value converts by molar mass, never 1:1.
 */
export const NH3_PER_NH4 = MOLAR_MASS.NH3 / MOLAR_MASS.NH4

/** mg/L of phosphate (PO4) per mg/L given as phosphorus (PO4-P). */
export const PO4_PER_PO4_P = MOLAR_MASS.PO4 / MOLAR_MASS.P

/** The German degree (°dH, also °dKH/°dGH) is defined as 10 mg/L CaO. */
export const CAO_MG_PER_L_PER_GERMAN_DEGREE = 10

/** 1 °dH expressed as mg/L CaCO3 (same number of moles as 10 mg/L CaO). */
export const CACO3_MG_PER_L_PER_GERMAN_DEGREE = (CAO_MG_PER_L_PER_GERMAN_DEGREE * MOLAR_MASS.CaCO3) / MOLAR_MASS.CaO

/**
 * 1 °dH in mmol/L of hardness (Ca2+ + Mg2+, or carbonate as CaCO3). Alkalinity quoted in
 * meq/L or as acid capacity is twice this number, because the ions are divalent.
 */
export const MMOL_PER_L_PER_GERMAN_DEGREE = CAO_MG_PER_L_PER_GERMAN_DEGREE / MOLAR_MASS.CaO

/** 1 °dKH of alkalinity in meq/L: carbonate is divalent, so two equivalents per mole. */
export const MEQ_PER_L_PER_GERMAN_DEGREE = 2 * MMOL_PER_L_PER_GERMAN_DEGREE

/** Fahrenheit scale: 32 °F is 0 °C and one kelvin is 1.8 °F. */
export const FAHRENHEIT_OFFSET = 32
export const FAHRENHEIT_PER_KELVIN = 1.8

/** The international inch is exactly 2.54 cm. */
export const CM_PER_INCH = 2.54
