import { PROBE_TRUST } from '../calibration/probe-trust'
import { jumped } from '../calibration/spikes'

export type TimedValue = { at: number; value: number }

/** One probe's recent readings as the spike filter sees them: the last one passed on, and one held back. */
export interface SpikeState {
  last?: TimedValue
  held?: TimedValue
}

/** How long a held reading waits for the next before it is passed on anyway (`common practice`: a few reporting intervals). */
export const SPIKE_HOLD_MS = 10 * 60_000

/**
 * What the watch rules see of a probe: a reading that jumps more than the metric's spike size
 * (PROBE_TRUST) from the last one is held back until the next arrives. If the next is back near
 * the old level, the held reading was a spike and is dropped; otherwise it was a real step and
 * both go on, each at its own time, so a rule's hold starts when the step did. Readings older
 * than the last pass straight through. Pure: returns the new state and the readings to evaluate.
 */
export function spikeStep(metric: string, state: SpikeState, reading: TimedValue): { state: SpikeState; pass: TimedValue[] } {
  const trust = PROBE_TRUST[metric as keyof typeof PROBE_TRUST]
  if (!trust || (state.last && reading.at < state.last.at) || (state.held && reading.at < state.held.at)) return { state, pass: [reading] }
  const far = (from: TimedValue, to: TimedValue) => jumped(from.value, to.value, trust.spike)
  if (state.held && state.last) {
    if (!far(state.last, reading)) return { state: { last: reading }, pass: [reading] }
    return { state: { last: reading }, pass: [state.held, reading] }
  }
  if (state.last && far(state.last, reading)) return { state: { ...state, held: reading }, pass: [] }
  return { state: { last: reading }, pass: [reading] }
}

/** On the clock: a held reading with no successor for SPIKE_HOLD_MS goes on (the probe may have stopped after a real step). */
export function spikeRelease(state: SpikeState, at: number): { state: SpikeState; pass: TimedValue[] } {
  if (!state.held || at - state.held.at < SPIKE_HOLD_MS) return { state, pass: [] }
  return { state: { last: state.held }, pass: [state.held] }
}
