import { PROBE_TRUST } from '../calibration/probe-trust'
import type { MetricKey } from '../metrics/registry'
import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleInput, RuleState } from './types'

type StuckSpec = SpecOfKind<'stuck'>

/** Starter period: three hours without moving past the noise floor (`common practice`). */
export const DEFAULT_STUCK_MINUTES = 180

/** The starter spec of a metric, from PROBE_TRUST (`common practice`). */
export function defaultStuckSpec(metric: MetricKey): StuckSpec | null {
  const trust = PROBE_TRUST[metric]
  return trust ? { kind: 'stuck', metric, flatMinutes: DEFAULT_STUCK_MINUTES, noiseFloor: trust.noiseFloor } : null
}

/**
 * A probe whose readings stay within the noise floor for `flatMinutes`, after it has been seen
 * to move, may be frozen or out of the water. `band` is the lowest and highest value since the
 * flat run began (`since`); a reading outside the noise floor starts a new run and clears. Only a
 * probe seen moving counts: `lastReadingAt` is set from the first movement on, so an engine
 * rebuilt in the middle of a long flat run keeps an open incident rather than clearing it.
 * The trip's value is the minutes the probe has stood still.
 */
export function evaluateStuck(spec: StuckSpec, state: RuleState, input: RuleInput): EvaluationResult {
  if (input.type === 'tick' || input.source === 'test_kit') return { state }
  const v = input.value
  if (!state.band || state.since === undefined) return { state: { ...state, band: [v, v], since: input.at } }
  const low = Math.min(state.band[0], v)
  const high = Math.max(state.band[1], v)
  if (high - low > spec.noiseFloor + 1e-9) {
    const next: RuleState = { status: 'clear', band: [v, v], since: input.at, moved: true, lastValue: v, lastReadingAt: input.at }
    return state.status === 'tripped' ? { state: next, event: { type: 'clear', at: input.at, value: v } } : { state: next }
  }
  const next: RuleState = { ...state, band: [low, high], lastValue: v, ...(state.moved ? { lastReadingAt: input.at } : {}) }
  const flatMinutes = Math.round((input.at - state.since) / 60_000)
  if (state.status === 'tripped')
    return { state: { ...next, peakValue: flatMinutes }, event: { type: 'update', at: input.at, value: flatMinutes, peak: flatMinutes } }
  if (!state.moved || flatMinutes < spec.flatMinutes) return { state: next }
  return {
    state: { ...next, status: 'tripped', peakValue: flatMinutes },
    event: { type: 'trip', at: input.at, value: flatMinutes, since: state.since },
  }
}
