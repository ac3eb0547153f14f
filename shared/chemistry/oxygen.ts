// Saturation dissolved oxygen in fresh water, after Benson & Krause (1984, Limnol. Oceanogr.
// 29:620–632) in the form USGS prescribes (Office of Water Quality Technical Memorandum 2011.03,
// the equations behind DOTABLES). Valid for 0–40 °C and 0.5–1.1 atm.
import { requireFitTemperature, requireInRange, requireNonNegative } from './validate'

export const STANDARD_PRESSURE_KPA = 101.325
const MIN_PRESSURE_KPA = 0.5 * STANDARD_PRESSURE_KPA
const MAX_PRESSURE_KPA = 1.1 * STANDARD_PRESSURE_KPA

/** mg/L O2 in water in equilibrium with water-saturated air at 1 atm. */
function solubilityAtOneAtm(kelvin: number): number {
  return Math.exp(-139.34411 + 1.575701e5 / kelvin - 6.642308e7 / kelvin ** 2 + 1.2438e10 / kelvin ** 3 - 8.621949e11 / kelvin ** 4)
}

/** Saturation vapour pressure of water in atm (the memo's fit). */
function waterVapourPressureAtm(kelvin: number): number {
  return Math.exp(11.8571 - 3840.7 / kelvin - 216961 / kelvin ** 2)
}

/**
 * Saturation DO (mg/L) at the given water temperature and barometric pressure.
 * The pressure factor removes water vapour from the total pressure and applies the
 * non-ideal-gas term θ, so it is slightly less than a plain P/101.325 scaling.
 */
export function oxygenSolubilityMgL(tempC: number, pressureKPa: number = STANDARD_PRESSURE_KPA): number {
  requireFitTemperature('tempC', tempC)
  requireInRange('pressureKPa', pressureKPa, MIN_PRESSURE_KPA, MAX_PRESSURE_KPA, 'kPa')
  const kelvin = tempC + 273.15
  const pAtm = pressureKPa / STANDARD_PRESSURE_KPA
  const u = waterVapourPressureAtm(kelvin)
  const theta = 0.000975 - 1.426e-5 * tempC + 6.436e-8 * tempC ** 2
  const pressureFactor = ((pAtm - u) * (1 - theta * pAtm)) / ((1 - u) * (1 - theta))
  return solubilityAtOneAtm(kelvin) * pressureFactor
}

/** Measured DO as a percentage of saturation at that temperature and pressure. */
export function percentSaturation(measuredMgL: number, tempC: number, pressureKPa: number = STANDARD_PRESSURE_KPA): number {
  requireNonNegative('measuredMgL', measuredMgL)
  return (100 * measuredMgL) / oxygenSolubilityMgL(tempC, pressureKPa)
}
