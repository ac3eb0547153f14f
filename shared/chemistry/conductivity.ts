// Conductivity referred to 25 °C and the rough TDS it implies.
import { requireFitTemperature, requireInRange, requireNonNegative } from './validate'

/**
 * Linear temperature compensation, Standard Methods 2510 B:
 *   κ25 = κt / (1 + α (t − 25)), α ≈ 0.0191 /°C for KCl solutions.
 * Natural and tank waters have α of roughly 0.018–0.022, so α is adjustable.
 */
export function compensateTo25C(conductivityUsCm: number, tempC: number, alpha = 0.0191): number {
  requireNonNegative('conductivityUsCm', conductivityUsCm)
  requireFitTemperature('tempC', tempC)
  requireInRange('alpha', alpha, 0.01, 0.03, '/°C')
  return conductivityUsCm / (1 + alpha * (tempC - 25))
}

/**
 * TDS (mg/L) ≈ factor × κ25 (µS/cm). The factor depends on which ions dominate;
 * Standard Methods (1030 E) gives 0.55–0.7 for natural waters.
 */
export function tdsFromConductivity(uScm25: number, factor = 0.65): number {
  requireNonNegative('uScm25', uScm25)
  requireInRange('factor', factor, 0.55, 0.7)
  return uScm25 * factor
}
