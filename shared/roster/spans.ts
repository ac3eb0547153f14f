import type { DutySpan, RosterOverride, WeeklyShift } from './schema'
import { addDays, localToInstant, minutesOfClock, weekdayOf } from '../time/zoned'
import type { LocalDate } from '../time/zoned'

/**
 * The pattern's shifts that start on local `date`, as real instants. Durations follow the
 * clock on the wall: 01:00–05:00 lasts 3 h on the spring-forward night and 5 h on the autumn
 * one. A shift wholly inside a skipped hour has no length and is left out.
 */
export function patternSpansOn(pattern: readonly WeeklyShift[], timeZone: string, date: LocalDate): DutySpan[] {
  const weekday = weekdayOf(date)
  const spans: DutySpan[] = []
  for (const shift of pattern) {
    if (shift.weekday !== weekday) continue
    const start = minutesOfClock(shift.start)
    const end = minutesOfClock(shift.end)
    const startsAt = localToInstant(timeZone, date, start)
    const endsAt = localToInstant(timeZone, end <= start ? addDays(date, 1) : date, end)
    if (endsAt > startsAt) spans.push({ userId: shift.userId, startsAt, endsAt })
  }
  return spans
}

interface ParsedOverride extends DutySpan {
  kind: RosterOverride['kind']
}

const ISO_WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/i

function parseInstant(text: string): number {
  const ms = ISO_WITH_OFFSET.test(text) ? Date.parse(text) : Number.NaN
  if (Number.isNaN(ms)) throw new RangeError(`not an ISO date-time with an offset: ${text}`)
  return ms
}

export function parseOverrides(overrides: readonly RosterOverride[]): ParsedOverride[] {
  return overrides
    .map((o) => ({ userId: o.userId, kind: o.kind, startsAt: parseInstant(o.startsAt), endsAt: parseInstant(o.endsAt) }))
    .filter((o) => o.endsAt > o.startsAt)
}

function mergeOverlapping(spans: DutySpan[]): DutySpan[] {
  const sorted = [...spans].sort((a, b) => a.startsAt - b.startsAt || a.endsAt - b.endsAt)
  const merged: DutySpan[] = []
  for (const span of sorted) {
    const last = merged[merged.length - 1]
    // Only true overlaps merge; back-to-back shifts stay separate so a week view shows both.
    if (last && span.startsAt < last.endsAt) last.endsAt = Math.max(last.endsAt, span.endsAt)
    else merged.push({ ...span })
  }
  return merged
}

function subtract(spans: DutySpan[], holes: DutySpan[]): DutySpan[] {
  let remaining = spans
  for (const hole of holes) {
    remaining = remaining.flatMap((span) => {
      if (hole.endsAt <= span.startsAt || hole.startsAt >= span.endsAt) return [span]
      const pieces: DutySpan[] = []
      if (hole.startsAt > span.startsAt) pieces.push({ ...span, endsAt: hole.startsAt })
      if (hole.endsAt < span.endsAt) pieces.push({ ...span, startsAt: hole.endsAt })
      return pieces
    })
  }
  return remaining
}

/**
 * Pattern spans plus `add` overrides, minus `remove` overrides, per person. Where an `add`
 * and a `remove` for the same person overlap, `remove` wins: it records that they are away.
 */
export function applyOverrides(base: readonly DutySpan[], overrides: readonly RosterOverride[]): DutySpan[] {
  const parsed = parseOverrides(overrides)
  const users = new Set([...base.map((s) => s.userId), ...parsed.filter((o) => o.kind === 'add').map((o) => o.userId)])
  const result: DutySpan[] = []
  for (const userId of users) {
    const own = base.filter((s) => s.userId === userId)
    const adds = parsed.filter((o) => o.userId === userId && o.kind === 'add')
    const removes = parsed.filter((o) => o.userId === userId && o.kind === 'remove')
    const on = mergeOverlapping([...own, ...adds.map(({ startsAt, endsAt }) => ({ userId, startsAt, endsAt }))])
    result.push(...subtract(on, removes))
  }
  return result
}
