import type { MetricKey } from '../metrics/registry'

/**
 * How far a probe may be trusted, per metric, in the metric's stored unit (or as a fraction of the
 * value where `relative`): all `common practice`, not a published standard.
 * - `tolerance`: a test kit and the probe differing by more than this disagree (pH 0.2, 0.5 °C, 5 %).
 * - `noiseFloor`: changes smaller than this are a probe's own noise; a probe that moves less than
 *   this for hours while the tank normally moves is frozen or out of the water.
 * - `spike`: a single reading this far from both neighbours, which then agree, is a spike.
 */
export interface ProbeTrust {
  tolerance: number
  noiseFloor: number
  spike: number
  relative: boolean
}

export const PROBE_TRUST: Partial<Record<MetricKey, ProbeTrust>> = {
  ph: { tolerance: 0.2, noiseFloor: 0.01, spike: 0.5, relative: false },
  temperature: { tolerance: 0.5, noiseFloor: 0.05, spike: 2, relative: false },
  conductivity: { tolerance: 0.05, noiseFloor: 0.002, spike: 0.2, relative: true },
}

/** `amount` of a ProbeTrust field as an absolute band around `reference`. */
export const bandAround = (amount: number, relative: boolean, reference: number) => (relative ? amount * Math.abs(reference) : amount)

/** A test-kit value against the probe's at the same time: the difference (probe − kit) and whether it is too large. */
export function probeKitDifference(kit: number, probe: number, tolerance: number, relative: boolean) {
  const difference = probe - kit
  const limit = bandAround(tolerance, relative, kit)
  return { difference, limit, disagrees: Math.abs(difference) > limit + 1e-9 }
}
