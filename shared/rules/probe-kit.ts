import { PROBE_TRUST, probeKitDifference } from '../calibration/probe-trust'
import type { MetricKey } from '../metrics/registry'
import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleContext, RuleInput, RuleState } from './types'

type ProbeKitSpec = SpecOfKind<'probe_kit'>

/** Probe readings kept for comparing with a kit value entered later for an earlier time. */
export const PROBE_KIT_LOOKBACK_MINUTES = 24 * 60
const MAX_PROBE_POINTS = 300

/** Starter window: a kit value is compared with a probe reading at most this far from it, or the probe's interval if longer. */
export const DEFAULT_PROBE_KIT_WITHIN_MINUTES = 15

/** The starter spec of a metric, from PROBE_TRUST (`common practice`). */
export function defaultProbeKitSpec(metric: MetricKey): ProbeKitSpec | null {
  const trust = PROBE_TRUST[metric]
  if (!trust) return null
  return {
    kind: 'probe_kit',
    metric,
    tolerance: trust.tolerance.amount,
    tolerancePercent: trust.tolerance.percent,
    withinMinutes: DEFAULT_PROBE_KIT_WITHIN_MINUTES,
  }
}

/** The probe reading nearest to `at`, if one lies within `withinMs` of it. */
function nearest(points: ReadonlyArray<[number, number]>, at: number, withinMs: number): [number, number] | undefined {
  let best: [number, number] | undefined
  for (const p of points) if (Math.abs(p[0] - at) <= withinMs && (!best || Math.abs(p[0] - at) < Math.abs(best[0] - at))) best = p
  return best
}

/**
 * A test-kit value against the probe's reading at that time (the nearest within the probe's
 * reporting interval, or `withinMinutes` if longer). Probe readings are only remembered; each kit value is a verdict: too far
 * apart trips (value: probe − kit), agreeing again clears. The trip's detail carries both values.
 */
export function evaluateProbeKit(spec: ProbeKitSpec, state: RuleState, input: RuleInput, ctx: RuleContext): EvaluationResult {
  if (input.type === 'tick') return { state }
  if (input.source !== 'test_kit') {
    const kept = (state.window ?? []).filter(([at]) => at >= input.at - PROBE_KIT_LOOKBACK_MINUTES * 60_000)
    const index = kept.findIndex(([at]) => at > input.at)
    const window: Array<[number, number]> =
      index === -1 ? [...kept, [input.at, input.value]] : [...kept.slice(0, index), [input.at, input.value], ...kept.slice(index)]
    return { state: { ...state, window: window.slice(-MAX_PROBE_POINTS) } }
  }
  const within = Math.max(spec.withinMinutes * 60_000, ctx.probeIntervalMs ?? 0)
  const probe = nearest(state.window ?? [], input.at, within)
  if (!probe) return { state }
  const { difference, disagrees } = probeKitDifference(input.value, probe[1], { amount: spec.tolerance, percent: spec.tolerancePercent })
  const next: RuleState = { ...state, lastValue: input.value, lastReadingAt: input.at }
  const detail = { kit: input.value, probe: probe[1] }
  if (disagrees) {
    if (state.status === 'tripped') {
      return { state: { ...next, peakValue: difference }, event: { type: 'update', at: input.at, value: difference, peak: difference } }
    }
    return {
      state: { ...next, status: 'tripped', since: input.at, peakValue: difference },
      event: { type: 'trip', at: input.at, value: difference, since: input.at, detail },
    }
  }
  const clear: RuleState = { ...next, status: 'clear' }
  delete clear.since
  delete clear.peakValue
  return state.status === 'tripped' ? { state: clear, event: { type: 'clear', at: input.at, value: difference } } : { state: clear }
}
