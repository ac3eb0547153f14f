import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleInput, RuleState } from './types'

type RateSpec = SpecOfKind<'rate'>
type Point = [number, number]

/**
 * A sensor reporting every few seconds would otherwise keep a day's worth of points per rule.
 * The window keeps one point per slot of `windowMinutes / (MAX_WINDOW_POINTS - 2)` (about six
 * minutes in a day): the slot's oldest reading. The newest reading is the state's `lastValue`. So the change
 * across the window is measured from a point at most one slot younger than the exact oldest
 * reading, and a reading that lands in a slot already held changes no array: the hot path
 * copies the window only when a new slot begins.
 */
export const MAX_WINDOW_POINTS = 240

// A window of W spans at most W / slot + 2 slots (both ends partly), so this many slots keep it within the bound.
const slotMs = (windowMs: number) => windowMs / (MAX_WINDOW_POINTS - 2)
const sameSlot = (a: number, b: number, windowMs: number) => Math.floor(a / slotMs(windowMs)) === Math.floor(b / slotMs(windowMs))

/**
 * The window with an in-order point taken in and the points older than the window dropped (the
 * boundary is inclusive: a reading exactly `windowMinutes` old still counts). Unchanged, the
 * same array comes back.
 */
function slide(points: Point[], point: Point, windowMs: number): Point[] {
  const cutoff = point[0] - windowMs
  let first = 0
  while (first < points.length && (points[first] as Point)[0] < cutoff) first++
  const last = points[points.length - 1]
  const opensSlot = first === points.length || !last || !sameSlot(last[0], point[0], windowMs)
  if (first === 0 && !opensSlot) return points
  const next = points.slice(first)
  if (opensSlot) next.push(point)
  return next
}

/** A late point slotted in by time; it replaces the point of its slot when it is older. */
function insertLate(points: Point[], point: Point, windowMs: number): Point[] {
  const index = points.findIndex(([at]) => at > point[0])
  const before = index === -1 ? points.length - 1 : index - 1
  const neighbour = points[before]
  if (neighbour && sameSlot(neighbour[0], point[0], windowMs)) return points
  const after = points[before + 1]
  const replaces = after && sameSlot(after[0], point[0], windowMs) ? 1 : 0
  return [...points.slice(0, before + 1), point, ...points.slice(before + 1 + replaces)]
}

/** Newest minus oldest; undefined until the window reaches back before the newest reading. */
export function changeAcross(points: Point[], newest: Point): number | undefined {
  const oldest = points[0]
  if (!oldest || oldest[0] >= newest[0]) return undefined
  return newest[1] - oldest[1]
}

/**
 * Ticks do nothing: without a new reading the measured change cannot move, and a sensor that
 * stopped reporting is the `quiet` rule's business. A late reading (older than the last one)
 * is slotted into the window when it falls inside it, but neither trips nor clears anything
 * by itself; the next in-order reading judges the window including it.
 */
export function evaluateRate(spec: RateSpec, state: RuleState, input: RuleInput): EvaluationResult {
  if (input.type === 'tick') return { state }
  const windowMs = spec.windowMinutes * 60_000
  const point: Point = [input.at, input.value]
  const window = state.window ?? []

  if (state.lastReadingAt !== undefined && input.at < state.lastReadingAt) {
    if (input.at < state.lastReadingAt - windowMs) return { state }
    return { state: { ...state, window: insertLate(window, point, windowMs) } }
  }

  const nextWindow = slide(window, point, windowMs)
  const base: RuleState = { ...state, window: nextWindow, lastValue: input.value, lastReadingAt: input.at }
  const change = changeAcross(nextWindow, point)
  const exceeded = change !== undefined && Math.abs(change) > spec.maxChange

  if (state.status !== 'tripped') {
    if (!exceeded || change === undefined) return { state: { ...base, status: 'clear' } }
    return {
      state: { ...base, status: 'tripped', since: input.at, peakValue: change },
      event: { type: 'trip', at: input.at, value: change, since: input.at },
    }
  }

  if (!exceeded || change === undefined) {
    const cleared: RuleState = { ...base, status: 'clear' }
    delete cleared.since
    delete cleared.peakValue
    // A lone reading after a long gap measures no change at all, which is within the limit.
    const event = change === undefined ? { type: 'clear' as const, at: input.at } : { type: 'clear' as const, at: input.at, value: change }
    return { state: cleared, event }
  }
  const previous = state.peakValue ?? change
  const peak = Math.abs(change) > Math.abs(previous) ? change : previous
  return {
    state: { ...base, peakValue: peak },
    event: { type: 'update', at: input.at, value: change, peak },
  }
}
