// Dissolved CO2 from pH, KH and temperature via the first carbonic-acid dissociation:
//   CO2(aq) + H2O ⇌ H+ + HCO3-,  K1 = [H+][HCO3-] / [CO2]
// Simplifications: carbonate alkalinity is taken as all bicarbonate (carbonate is a few
// percent at pH 9 and less below); activity coefficients are ignored; KH is assumed to be
// carbonate hardness only (phosphate or other buffers would make the result read high).
import { requireFitTemperature, requireInRange, requirePositive } from './validate'

/** 1 °dKH = 10 mg/L CaO = 17.848 mg/L as CaCO3; CaCO3 has 50.04 mg per meq. */
export const MEQ_PER_L_PER_DKH = 17.848 / 50.04
const CO2_MG_PER_MMOL = 44.01
/** Outside this band the bicarbonate-only assumption stops holding. */
const MIN_PH = 5
const MAX_PH = 9

/**
 * pK1 of carbonic acid from Plummer & Busenberg (1982, Geochim. Cosmochim. Acta
 * 46:1011–1040), valid 0–90 °C; we accept 0–40 °C.
 */
export function carbonicAcidPK1(tempC: number): number {
  requireFitTemperature('tempC', tempC)
  const t = tempC + 273.15
  const logK1 = -356.3094 - 0.06091964 * t + 21834.37 / t + 126.8339 * Math.log10(t) - 1684915 / t ** 2
  return -logK1
}

function validatePhKh(pH: number, kh: number): void {
  requireInRange('pH', pH, MIN_PH, MAX_PH)
  requirePositive('kh', kh)
}

/** CO2 in mg/L at carbonate equilibrium. */
export function co2FromPhKh(pH: number, kh: number, tempC: number): number {
  validatePhKh(pH, kh)
  const bicarbonateMmolL = kh * MEQ_PER_L_PER_DKH
  const co2MmolL = (bicarbonateMmolL * 10 ** -pH) / 10 ** -carbonicAcidPK1(tempC)
  return co2MmolL * CO2_MG_PER_MMOL
}

/**
 * Rule of thumb (common practice, no source): CO2 ≈ 3 × KH × 10^(7 − pH) mg/L.
 * It has no temperature term and reads lower than co2FromPhKh across 0–40 °C.
 */
export function co2RuleOfThumb(pH: number, kh: number): number {
  validatePhKh(pH, kh)
  return 3 * kh * 10 ** (7 - pH)
}
