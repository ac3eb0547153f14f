import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleContext, RuleInput, RuleState } from './types'

type LevelSpec = SpecOfKind<'above' | 'below' | 'outside' | 'heater_line' | 'light_schedule'>

/** How one level-style rule judges a single value; every level kind reduces to this. */
export interface LevelJudge {
  holdMs: number
  /** The condition that opens the hold, then the trip. */
  breached(value: number, at: number): boolean
  /** While tripped: far enough back to clear (hysteresis lives here). */
  cleared(value: number, at: number): boolean
  /** Larger is worse; picks the peak. */
  badness(value: number): number
  /** The verdict can change with no new reading (schedule flips), so ticks re-judge. */
  judgesOnTicks: boolean
}

const MINUTE_MS = 60_000

/** `null` when the tank context lacks what the rule needs: the rule then stays inert. */
export function levelJudge(spec: LevelSpec, ctx: RuleContext): LevelJudge | null {
  const holdMs = spec.holdMinutes * MINUTE_MS
  switch (spec.kind) {
    case 'above':
      return {
        holdMs,
        breached: (v) => v > spec.limit,
        cleared: (v) => v < spec.limit - spec.clearMargin,
        badness: (v) => v,
        judgesOnTicks: false,
      }
    case 'below':
      return {
        holdMs,
        breached: (v) => v < spec.limit,
        cleared: (v) => v > spec.limit + spec.clearMargin,
        badness: (v) => -v,
        judgesOnTicks: false,
      }
    case 'outside':
      return {
        holdMs,
        breached: (v) => v < spec.min || v > spec.max,
        cleared: (v) => v > spec.min + spec.clearMargin && v < spec.max - spec.clearMargin,
        badness: (v) => Math.max(v - spec.max, spec.min - v),
        judgesOnTicks: false,
      }
    case 'heater_line': {
      if (ctx.heaterTopCm === undefined || !Number.isFinite(ctx.heaterTopCm)) return null
      const line = ctx.heaterTopCm + spec.marginCm
      return {
        holdMs,
        breached: (v) => v <= line,
        cleared: (v) => v > line + spec.clearMargin,
        badness: (v) => -v,
        judgesOnTicks: false,
      }
    }
    case 'light_schedule': {
      const isScheduledOn = ctx.isScheduledOn
      if (!isScheduledOn) return null
      const disagrees = (v: number, at: number) => v >= spec.onLux !== isScheduledOn(at)
      return {
        holdMs,
        breached: disagrees,
        cleared: (v, at) => !disagrees(v, at),
        // Without the schedule at the peak's time, distance from the threshold is the fair measure.
        badness: (v) => Math.abs(v - spec.onLux),
        judgesOnTicks: true,
      }
    }
  }
}

function trip(state: RuleState, at: number, value: number, holdStart: number): EvaluationResult {
  return {
    state: { ...state, status: 'tripped', since: at, peakValue: value },
    event: { type: 'trip', at, value, since: holdStart },
  }
}

function toClear(state: RuleState): RuleState {
  const next: RuleState = { ...state, status: 'clear' }
  delete next.since
  delete next.peakValue
  return next
}

/**
 * When a standing reading starts to disagree with a moving schedule, the hold starts when the
 * schedule flipped, not when a tick happened to notice: bisect (to the second) between the
 * reading, judged fine then, and now. Assumes at most one flip in between, true for any tank
 * reporting more often than its photoperiod changes. This is what lets a restarted engine,
 * which sees no old ticks, land on the same hold start as one that never stopped.
 */
function onsetAfter(judge: LevelJudge, value: number, fineAt: number, breachedAt: number): number {
  let fineSecond = Math.floor(fineAt / 1000)
  let breachedSecond = Math.floor(breachedAt / 1000)
  if (breachedSecond <= fineSecond || !judge.breached(value, breachedSecond * 1000)) return breachedAt
  while (breachedSecond - fineSecond > 1) {
    const mid = Math.floor((fineSecond + breachedSecond) / 2)
    if (judge.breached(value, mid * 1000)) breachedSecond = mid
    else fineSecond = mid
  }
  return breachedSecond * 1000
}

/**
 * One observation of `value` at `at`: a fresh reading, or on ticks for schedule-dependent
 * rules the last reading re-judged against the clock. Only fresh readings emit `update`.
 */
function observe(judge: LevelJudge, state: RuleState, at: number, value: number, fresh: boolean): EvaluationResult {
  switch (state.status) {
    case 'clear': {
      if (!judge.breached(value, at)) return { state }
      const onset = fresh || state.lastReadingAt === undefined ? at : onsetAfter(judge, value, state.lastReadingAt, at)
      if (at >= onset + judge.holdMs) return trip(state, fresh ? at : onset + judge.holdMs, value, onset)
      return { state: { ...state, status: 'holding', since: onset } }
    }
    case 'holding': {
      const holdStart = state.since ?? at
      if (!judge.breached(value, at)) return { state: toClear(state) }
      if (at >= holdStart + judge.holdMs) return trip(state, fresh ? at : holdStart + judge.holdMs, value, holdStart)
      return { state }
    }
    case 'tripped': {
      if (judge.cleared(value, at)) return { state: toClear(state), event: { type: 'clear', at, value } }
      if (!fresh) return { state }
      const previous = state.peakValue ?? value
      const peak = judge.badness(value) > judge.badness(previous) ? value : previous
      return { state: { ...state, peakValue: peak }, event: { type: 'update', at, value, peak } }
    }
  }
}

export function evaluateLevel(judge: LevelJudge, state: RuleState, input: RuleInput): EvaluationResult {
  if (input.type === 'reading') {
    const next: RuleState = { ...state, lastValue: input.value, lastReadingAt: input.at }
    return observe(judge, next, input.at, input.value, true)
  }
  if (state.lastValue === undefined) return { state }
  if (judge.judgesOnTicks) return observe(judge, state, input.at, state.lastValue, false)
  // The last reading is taken to stand until the next one, so a tick can only end a hold. The
  // trip is dated when the hold ended, not when a tick noticed: a tick from an engine rebuilt
  // after a restart may come long after, and it must open the incident where a running one would.
  if (state.status === 'holding' && state.since !== undefined && input.at >= state.since + judge.holdMs) {
    return trip(state, state.since + judge.holdMs, state.lastValue, state.since)
  }
  return { state }
}

// A judge depends only on its spec and context, which the engine keeps for a rule's life: made once
// per pair rather than once per reading (the hot path meets every rule of a tank on every reading).
const judges = new WeakMap<object, WeakMap<object, LevelJudge | null>>()
function cachedJudge(spec: LevelSpec, ctx: RuleContext) {
  let byCtx = judges.get(spec)
  if (!byCtx) judges.set(spec, (byCtx = new WeakMap()))
  if (!byCtx.has(ctx)) byCtx.set(ctx, levelJudge(spec, ctx))
  return byCtx.get(ctx) ?? null
}

/** Any level kind: its judge made (once) from spec and context; without what it needs it stays inert. */
export function evaluateLevelSpec(spec: LevelSpec, state: RuleState, input: RuleInput, ctx: RuleContext): EvaluationResult {
  const judge = cachedJudge(spec, ctx)
  return judge ? evaluateLevel(judge, state, input) : { state }
}
