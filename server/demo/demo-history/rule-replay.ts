// The watch-rule trips a tank's history would have caused, found by the engine's own pure evaluator.
import { evaluate } from '@shared/rules/evaluate'
import { kindOf } from '@shared/rules/kinds'
import type { WatchRuleSpec } from '@shared/rules/schema'
import { initialRuleState, type RuleContext, type RuleEvent, type RuleInput } from '@shared/rules/types'

/** One incident's life as the rule saw it: trip, the worst value while tripped, and the clear (if any). */
export interface Trip {
  since: number
  at: number
  value: number
  peak: number
  latest: number
  latestAt: number
  clearedAt: number | null
  clearValue: number | undefined
}

/**
 * Feeds the readings in time order with a tick every `tickMs` in between, as the running engine
 * does with its timer (quiet rules and holds only trip on ticks), and collects the trips.
 */
export function replayTrips(
  spec: WatchRuleSpec,
  readings: { times: readonly number[]; values: readonly number[] },
  range: { fromMs: number; toMs: number; tickMs: number },
  ctx: RuleContext = {},
): Trip[] {
  const trips: Trip[] = []
  let state = initialRuleState()
  let open: Trip | null = null
  const feed = (input: RuleInput) => {
    const result = evaluate(spec, state, input, ctx)
    state = result.state
    if (result.event) open = onEvent(result.event, open, trips)
  }
  let next = 0
  for (let tick = range.fromMs; tick <= range.toMs; tick += range.tickMs) {
    while (next < readings.times.length && readings.times[next]! <= tick) {
      feed({ type: 'reading', at: readings.times[next]!, value: readings.values[next]! })
      next++
    }
    if (ticksMatter(spec, state.status)) feed({ type: 'tick', at: tick })
  }
  return trips
}

/**
 * A rate rule judges readings only, and a level rule that is clear waits for a reading (unless it
 * judges a schedule): the timer cannot move either, so those ticks are skipped.
 */
function ticksMatter(spec: WatchRuleSpec, status: string) {
  const when = kindOf(spec).ticksMatter
  return when === 'always' || (when === 'unless-clear' && status !== 'clear')
}

function onEvent(event: RuleEvent, open: Trip | null, trips: Trip[]): Trip | null {
  if (event.type === 'trip') {
    const trip: Trip = {
      since: event.since,
      at: event.at,
      value: event.value,
      peak: event.value,
      latest: event.value,
      latestAt: event.at,
      clearedAt: null,
      clearValue: undefined,
    }
    trips.push(trip)
    return trip
  }
  if (!open) return null
  if (event.type === 'update') {
    open.peak = event.peak
    open.latest = event.value
    open.latestAt = event.at
    return open
  }
  open.clearedAt = event.at
  open.clearValue = event.value
  return null
}
