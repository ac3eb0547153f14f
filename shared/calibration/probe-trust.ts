import type { MetricKey } from '../metrics/registry'

/** An allowed amount: absolute (in the metric's stored unit) or a percentage of the value, whichever is larger. */
export interface Band {
  amount: number
  percent: number
}

/**
 * How far a probe may be trusted, per metric: all `common practice`, not a published standard.
 * - `tolerance`: a test kit and the probe differing by more than this disagree (pH 0.2, 0.5 °C, 5 %).
 * - `noiseFloor`: changes smaller than this are a probe's own noise; a probe that moves less than
 *   this for hours while the tank normally moves is frozen or out of the water.
 * - `spike`: a single reading this far from both neighbours, which then agree, is a spike.
 */
export interface ProbeTrust {
  tolerance: Band
  noiseFloor: number
  spike: Band
}

export const PROBE_TRUST: Partial<Record<MetricKey, ProbeTrust>> = {
  ph: { tolerance: { amount: 0.2, percent: 0 }, noiseFloor: 0.01, spike: { amount: 0.5, percent: 0 } },
  temperature: { tolerance: { amount: 0.5, percent: 0 }, noiseFloor: 0.05, spike: { amount: 2, percent: 0 } },
  conductivity: { tolerance: { amount: 0, percent: 5 }, noiseFloor: 1, spike: { amount: 0, percent: 20 } },
}

/** A band as an absolute width around `reference`. */
export const bandAround = (band: Band, reference: number) => Math.max(band.amount, (band.percent / 100) * Math.abs(reference))

/** A test-kit value against the probe's at the same time: the difference (probe − kit) and whether it is too large. */
export function probeKitDifference(kit: number, probe: number, tolerance: Band) {
  const difference = probe - kit
  const limit = bandAround(tolerance, kit)
  return { difference, limit, disagrees: Math.abs(difference) > limit + 1e-9 }
}
