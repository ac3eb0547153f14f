// Density and specific gravity of seawater at one atmosphere: the one-atmosphere equation of state
// of EOS-80 (Millero & Poisson, "International one-atmosphere equation of state of seawater",
// Deep-Sea Research 28A, 1981), as given in UNESCO Technical Papers in Marine Science 44
// (Fofonoff & Millard, 1983), with standard mean ocean water for the pure-water term.
import { T68_PER_T90 } from './salinity'
import { requireInRange } from './validate'

const SMOW = [999.842594, 6.793952e-2, -9.09529e-3, 1.001685e-4, -1.120083e-6, 6.536332e-9]
const A = [8.24493e-1, -4.0899e-3, 7.6438e-5, -8.2467e-7, 5.3875e-9]
const B = [-5.72466e-3, 1.0227e-4, -1.6546e-6]
const C0 = 4.8314e-4

const poly = (coefficients: number[], x: number) => coefficients.reduceRight((sum, c) => sum * x + c, 0)

/** The equation is fitted for 0–42 practical salinity and 0–40 °C. */
export const EOS80_MAX_SALINITY = 42

/** Pure (standard mean ocean) water density, kg/m³, at a temperature in °C (ITS-90). */
export function pureWaterDensity(tempC: number): number {
  requireInRange('tempC', tempC, 0, 40, '°C')
  return poly(SMOW, tempC * T68_PER_T90)
}

/** Seawater density, kg/m³, at one atmosphere from practical salinity and temperature in °C (ITS-90). */
export function seawaterDensity(salinity: number, tempC: number): number {
  requireInRange('salinity', salinity, 0, EOS80_MAX_SALINITY)
  requireInRange('tempC', tempC, 0, 40, '°C')
  const t = tempC * T68_PER_T90
  return poly(SMOW, t) + poly(A, t) * salinity + poly(B, t) * salinity ** 1.5 + C0 * salinity * salinity
}

/**
 * Specific gravity t/tRef: the water's density at `tempC` over pure water's at `refTempC`.
 * Read "at temperature" (tRef = t) or stated against a reference such as 25/25 °C, which is
 * what this product stores: the same water, as it would read at 25 °C against water at 25 °C.
 */
export function specificGravity(salinity: number, tempC: number, refTempC = tempC): number {
  return seawaterDensity(salinity, tempC) / pureWaterDensity(refTempC)
}

/** The reference of stored specific gravity: 25 °C water against pure water at 25 °C. */
export const SG_REFERENCE_C = 25

/**
 * Practical salinity from a specific gravity read at `tempC` against pure water at `refTempC`
 * (a hydrometer or refractometer reading): the density function inverted by bisection, which
 * converges because density rises with salinity at every temperature of the fit.
 */
export function salinityFromSpecificGravity(sg: number, tempC: number, refTempC = tempC): number {
  requireInRange('sg', sg, 0.9, 1.1)
  const target = sg * pureWaterDensity(refTempC)
  if (target < seawaterDensity(0, tempC) || target > seawaterDensity(EOS80_MAX_SALINITY, tempC)) {
    throw new RangeError(`specific gravity ${sg} at ${tempC} °C is outside 0–${EOS80_MAX_SALINITY} practical salinity`)
  }
  let low = 0
  let high = EOS80_MAX_SALINITY
  for (let i = 0; i < 60; i++) {
    const mid = (low + high) / 2
    if (seawaterDensity(mid, tempC) < target) low = mid
    else high = mid
  }
  return (low + high) / 2
}

/** A specific gravity read at one temperature, restated at the reference 25/25 °C. */
export function specificGravityAtReference(sgRead: number, readTempC: number, readRefTempC = readTempC): number {
  const salinity = salinityFromSpecificGravity(sgRead, readTempC, readRefTempC)
  return specificGravity(salinity, SG_REFERENCE_C, SG_REFERENCE_C)
}
