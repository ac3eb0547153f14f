import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleInput, RuleState } from './types'

type QuietSpec = SpecOfKind<'quiet'>

/**
 * Silence is measured from the last reading. Before any reading has been seen, the first tick
 * marks the start of watching (status `holding`, `since` = that tick), so a sensor that never
 * reports still trips once `quietMinutes` have passed. The trip's `value` is the minutes of
 * silence; the clear's `value` is the reading that ended it.
 */
export function evaluateQuiet(spec: QuietSpec, state: RuleState, input: RuleInput): EvaluationResult {
  if (input.type === 'reading') {
    const next: RuleState = { status: 'clear', lastValue: input.value, lastReadingAt: input.at }
    if (state.status === 'tripped') {
      return { state: next, event: { type: 'clear', at: input.at, value: input.value } }
    }
    return { state: next }
  }

  if (state.status === 'tripped') return { state }
  const silenceStart = state.lastReadingAt ?? (state.status === 'holding' ? state.since : undefined)
  if (silenceStart === undefined) return { state: { ...state, status: 'holding', since: input.at } }
  if (input.at < silenceStart + spec.quietMinutes * 60_000) return { state }
  return {
    state: { ...state, status: 'tripped', since: input.at },
    event: { type: 'trip', at: input.at, value: (input.at - silenceStart) / 60_000, since: silenceStart },
  }
}
