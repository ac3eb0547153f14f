import type { SpecOfKind } from './schema'
import type { EvaluationResult, RuleInput, RuleState } from './types'

type RateSpec = SpecOfKind<'rate'>
type Point = [number, number]

/**
 * A sensor reporting every few seconds would otherwise keep a day's worth of points per rule.
 * Thinning keeps the oldest and newest points, so the change across the window stays exact
 * at the moment of thinning; later, as the window slides, the next-oldest point may be a
 * little younger than it would have been.
 */
export const MAX_WINDOW_POINTS = 240

function thin(points: Point[]): Point[] {
  if (points.length <= MAX_WINDOW_POINTS) return points
  const last = points[points.length - 1] as Point
  const kept = points.slice(0, -1).filter((_, index) => index % 2 === 0)
  return [...kept, last]
}

/**
 * The window with an in-order point added and the points older than the window dropped (the
 * boundary is inclusive: a reading exactly `windowMinutes` old still counts). One copy per reading:
 * the window is in time order, and every reading of every tank meets it.
 */
function slide(points: Point[], point: Point, windowMs: number): Point[] {
  const cutoff = point[0] - windowMs
  let first = 0
  while (first < points.length && (points[first] as Point)[0] < cutoff) first++
  const next = points.slice(first)
  next.push(point)
  return next
}

function insertSorted(points: Point[], point: Point): Point[] {
  const index = points.findIndex(([at]) => at > point[0])
  if (index === -1) return [...points, point]
  return [...points.slice(0, index), point, ...points.slice(index)]
}

/** Newest minus oldest; undefined until the window holds two readings. */
export function changeAcross(points: Point[]): number | undefined {
  if (points.length < 2) return undefined
  const oldest = points[0] as Point
  const newest = points[points.length - 1] as Point
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
    return { state: { ...state, window: thin(insertSorted(window, point)) } }
  }

  const nextWindow = thin(slide(window, point, windowMs))
  const base: RuleState = { ...state, window: nextWindow, lastValue: input.value, lastReadingAt: input.at }
  const change = changeAcross(nextWindow)
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
