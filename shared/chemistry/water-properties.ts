// Physical properties of liquid fresh water near room temperature, shared by the tank
// volume, weight and heating computations.
import { requireFitTemperature } from './validate'

/**
 * Density of air-free water at 1 atm in kg/L (= g/mL), from Kell's 1975 fit
 * (J. Chem. Eng. Data 20:97–105), the basis of the CRC Handbook density table.
 * Kell's fit is good to about 150 °C; we accept the 0–40 °C range a tank can be in.
 */
export function waterDensityKgPerL(tempC: number): number {
  requireFitTemperature('tempC', tempC)
  const t = tempC
  const kgPerM3 =
    (999.83952 + 16.945176 * t - 7.9870401e-3 * t ** 2 - 46.170461e-6 * t ** 3 + 105.56302e-9 * t ** 4 - 280.54253e-12 * t ** 5) / (1 + 16.87985e-3 * t)
  return kgPerM3 / 1000
}

/**
 * Isobaric specific heat of liquid water at 25 °C, kJ/(kg·K) (CRC Handbook / NIST).
 * It varies by under 0.3 % over 15–40 °C, so one value serves for heater sizing.
 */
export const WATER_SPECIFIC_HEAT_KJ_PER_KG_K = 4.1813
