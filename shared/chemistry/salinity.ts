// Practical salinity from conductivity: the Practical Salinity Scale 1978 (PSS-78), as given in
// Fofonoff & Millard, "Algorithms for computation of fundamental properties of seawater",
// UNESCO Technical Papers in Marine Science 44 (1983), after Lewis & Perkin (1981).
import { requireInRange, requireNonNegative } from './validate'

/** ITS-90 to IPTS-68 (UNESCO 44 and its tables use IPTS-68): T68 = 1.00024 × T90. */
export const T68_PER_T90 = 1.00024

/** C(35, 15 °C, 0): the conductivity of standard seawater of practical salinity 35 at 15 °C, 42.914 mS/cm. */
export const STANDARD_SEAWATER_MS_CM = 42.914

const A = [0.008, -0.1692, 25.3851, 14.0941, -7.0261, 2.7081]
const B = [0.0005, -0.0056, -0.0066, -0.0375, 0.0636, -0.0144]
const C = [0.6766097, 2.00564e-2, 1.104259e-4, -6.9698e-7, 1.0031e-9]
const D = [3.426e-2, 4.464e-4, 4.215e-1, -3.107e-3]
const E = [2.07e-5, -6.37e-10, 3.989e-15]
const K = 0.0162

const poly = (coefficients: number[], x: number) => coefficients.reduceRight((sum, c) => sum * x + c, 0)

/**
 * Practical salinity from the conductivity ratio R = C(S, t, p) / C(35, 15, 0), the temperature
 * in °C (ITS-90) and the gauge pressure in dbar (0 at the surface, which is every tank).
 * PSS-78 is defined for 2 ≤ S ≤ 42 and −2 to 35 °C; it is used here from 0 to 40 °C.
 */
export function practicalSalinity(ratio: number, tempC: number, pressureDbar = 0): number {
  requireNonNegative('ratio', ratio)
  requireInRange('tempC', tempC, -2, 40, '°C')
  requireInRange('pressureDbar', pressureDbar, 0, 10000, 'dbar')
  if (ratio === 0) return 0
  const t = tempC * T68_PER_T90
  const p = pressureDbar
  const rt = poly(C, t)
  const rp = 1 + (p * (E[0] + E[1] * p + E[2] * p * p)) / (1 + D[0] * t + D[1] * t * t + (D[2] + D[3] * t) * ratio)
  const rT = ratio / (rp * rt)
  const x = Math.sqrt(rT)
  const deltaS = ((t - 15) / (1 + K * (t - 15))) * poly(B, x)
  return poly(A, x) + deltaS
}

/** Practical salinity of tank water from a probe's conductivity (µS/cm, not temperature-compensated) and its temperature (°C). */
export function salinityFromConductivity(conductivityUsCm: number, tempC: number): number {
  requireNonNegative('conductivityUsCm', conductivityUsCm)
  return practicalSalinity(conductivityUsCm / 1000 / STANDARD_SEAWATER_MS_CM, tempC, 0)
}

/** The conductivity (µS/cm) water of a practical salinity shows at a temperature: PSS-78 inverted by bisection. */
export function conductivityFromSalinity(salinity: number, tempC: number): number {
  requireInRange('salinity', salinity, 0, 42)
  let low = 0
  let high = 3
  for (let i = 0; i < 60; i++) {
    const mid = (low + high) / 2
    if (practicalSalinity(mid, tempC) < salinity) low = mid
    else high = mid
  }
  return ((low + high) / 2) * STANDARD_SEAWATER_MS_CM * 1000
}
