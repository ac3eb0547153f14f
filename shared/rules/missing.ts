import { kindOf } from './kinds'
import { MISSING_AFTER_MINUTES, type WatchRuleSpec } from './schema'
import type { EvaluationResult, RuleState } from './types'

const MISSING_MS = MISSING_AFTER_MINUTES * 60_000

/**
 * On a tick, what a rule makes of its readings having stopped. `keep` (the default) leaves the
 * state as the last reading left it; `tripped` trips it once the readings are missing; `clear`
 * clears it, and it then waits for a fresh reading. Dated when the reading became missing, not
 * when a tick noticed. `undefined` when the rule goes on as usual.
 */
export function missingVerdict(spec: WatchRuleSpec, state: RuleState, at: number): EvaluationResult | undefined {
  const meaning = spec.missingReading ?? 'keep'
  if (meaning === 'keep' || !kindOf(spec).asksMissingReading || state.lastReadingAt === undefined) return undefined
  const missingSince = state.lastReadingAt + MISSING_MS
  if (at < missingSince) return undefined
  if (meaning === 'tripped') {
    if (state.status === 'tripped') return { state }
    const value = state.lastValue ?? 0
    return {
      state: { ...state, status: 'tripped', since: missingSince, peakValue: value },
      event: { type: 'trip', at: missingSince, value, since: state.since ?? missingSince },
    }
  }
  if (state.status === 'clear') return { state }
  const next: RuleState = { ...state, status: 'clear' }
  delete next.since
  delete next.peakValue
  return state.status === 'tripped' ? { state: next, event: { type: 'clear', at: missingSince } } : { state: next }
}
