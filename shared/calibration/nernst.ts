// The ideal response of a glass pH electrode: RT·ln10/F volts per pH unit (the Nernst slope).

/** Molar gas constant, J mol⁻¹ K⁻¹ (CODATA 2018, exact since the 2019 SI redefinition). */
export const GAS_CONSTANT_R = 8.314462618
/** Faraday constant, C mol⁻¹ (CODATA 2018, exact since the 2019 SI redefinition). */
export const FARADAY_CONSTANT_F = 96485.33212
/** Zero of the Celsius scale in kelvin. */
export const KELVIN_OFFSET = 273.15

/** The ideal electrode slope at `temperatureC`, in millivolts per pH unit (59.16 at 25 °C). */
export function nernstSlopeMv(temperatureC: number): number {
  return ((GAS_CONSTANT_R * (temperatureC + KELVIN_OFFSET) * Math.LN10) / FARADAY_CONSTANT_F) * 1000
}
