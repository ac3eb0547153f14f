// Un-ionised ammonia (NH3) share of total ammonia in fresh water, after Emerson, Russo, Lund &
// Thurston (1975, J. Fish. Res. Board Can. 32:2379–2383): pKa = 0.09018 + 2729.92 / T.
// Emerson et al. and the US EPA ammonia criteria documents take T = 273.2 + t, so do we;
// the result is in the same unit as the total (mg/L as NH3 or as N).
import { requireFitTemperature, requireNonNegative, requirePh } from './validate'

export function ammoniumPKa(tempC: number): number {
  requireFitTemperature('tempC', tempC)
  return 0.09018 + 2729.92 / (273.2 + tempC)
}

/** Fraction (0–1) of total ammonia present as NH3. Ionic-strength effects are ignored. */
export function unionisedAmmoniaFraction(pH: number, tempC: number): number {
  requirePh('pH', pH)
  return 1 / (10 ** (ammoniumPKa(tempC) - pH) + 1)
}

export function unionisedAmmoniaMgL(totalAmmoniaMgL: number, pH: number, tempC: number): number {
  requireNonNegative('totalAmmoniaMgL', totalAmmoniaMgL)
  return totalAmmoniaMgL * unionisedAmmoniaFraction(pH, tempC)
}
