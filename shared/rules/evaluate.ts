import { kindOf } from './kinds'
import { missingVerdict } from './missing'
import type { WatchRuleSpec } from './schema'
import { initialRuleState } from './types'
import type { EvaluationResult, RuleContext, RuleEvent, RuleInput, RuleState } from './types'

/**
 * Feeds one input to one rule. Pure: the same spec, state, input and context always give the
 * same answer, and the input state is never mutated.
 *
 * Late readings (`at` earlier than `lastReadingAt`) change nothing and emit nothing, because
 * the hold and hysteresis logic assumes each reading stands until the next one and a late
 * reading would rewrite a past the incident timeline has already recorded. A kind that
 * `takesLateReadings` (`rate`) is the exception: it slots a late reading into its window. Readings with a
 * non-finite value are ignored the same way.
 */
export function evaluate(spec: WatchRuleSpec, state: RuleState, input: RuleInput, ctx: RuleContext = {}): EvaluationResult {
  const kind = kindOf(spec)
  if (input.type === 'reading') {
    if (!Number.isFinite(input.value) || !Number.isFinite(input.at)) return { state }
    const late = state.lastReadingAt !== undefined && input.at < state.lastReadingAt
    if (late && !kind.takesLateReadings) return { state }
  } else {
    const missing = missingVerdict(spec, state, input.at)
    if (missing) return missing
  }
  return kind.step(spec, state, input, ctx)
}

export interface ReplayResult {
  state: RuleState
  events: RuleEvent[]
}

/** Stored readings in time order, then one tick at `now`; every event along the way. */
export function replay(
  spec: WatchRuleSpec,
  readings: ReadonlyArray<{ at: number; value: number; source?: 'device' | 'test_kit' | 'import' }>,
  now: number,
  ctx: RuleContext = {},
): ReplayResult {
  const sorted = [...readings].sort((a, b) => a.at - b.at)
  const events: RuleEvent[] = []
  let state = initialRuleState()
  const inputs: RuleInput[] = [
    ...sorted.map((r): RuleInput => ({ type: 'reading', at: r.at, value: r.value, ...(r.source ? { source: r.source } : {}) })),
    { type: 'tick', at: now },
  ]
  for (const input of inputs) {
    const result = evaluate(spec, state, input, ctx)
    state = result.state
    if (result.event) events.push(result.event)
  }
  return { state, events }
}

/**
 * The state a rule would be in at `now` had the engine never stopped, rebuilt from the
 * readings it stored. A rule that is already tripped comes back `tripped` (its incident is
 * already open, so nothing new opens); one mid-hold comes back `holding` with the original
 * `since`, so it trips at the same moment an uninterrupted run would. Pass the readings of
 * at least the longest hold, window or quiet period back from `now`.
 */
export function rebuildState(spec: WatchRuleSpec, readings: ReadonlyArray<{ at: number; value: number }>, now: number, ctx: RuleContext = {}): RuleState {
  return replay(spec, readings, now, ctx).state
}
