import type { DutySpan, RosterOverride, WeeklyShift } from './schema'
import { applyOverrides, patternSpansOn } from './spans'
import { addDays, localDateAt, localToInstant, parseLocalDate } from '../time/zoned'

export * from './schema'
export { isValidTimeZone, localToInstant, offsetAt, parseLocalDate } from '../time/zoned'
export type { LocalDate } from '../time/zoned'

export type RosterPattern = readonly WeeklyShift[] | { shifts: readonly WeeklyShift[] }

const shiftsOf = (roster: RosterPattern): readonly WeeklyShift[] => ('shifts' in roster ? roster.shifts : roster)

/**
 * Who is on duty at `atMs`: user ids, each once, in default string order; `[]` when nobody is.
 * Spans include their start and exclude their end, so at a handover only the incoming person
 * is on duty.
 */
export function onDutyAt(roster: RosterPattern, overrides: readonly RosterOverride[], timeZone: string, atMs: number): string[] {
  const today = localDateAt(timeZone, atMs)
  // A shift covering `atMs` started today or, running past midnight, yesterday; tomorrow is
  // included only so a zone that changes its clocks at midnight cannot hide one.
  const base = [-1, 0, 1].flatMap((days) => patternSpansOn(shiftsOf(roster), timeZone, addDays(today, days)))
  const spans = applyOverrides(base, overrides)
  const onDuty = new Set(spans.filter((s) => s.startsAt <= atMs && atMs < s.endsAt).map((s) => s.userId))
  return [...onDuty].sort()
}

/**
 * Every stretch of duty that overlaps the seven local days from `weekStartLocalDate`
 * (any weekday may start the view), in real instants. Spans are not clipped to the week: a
 * Sunday night shift shows its true end on Monday morning. Sorted by start, then user.
 */
export function shiftsInWeek(roster: RosterPattern, overrides: readonly RosterOverride[], timeZone: string, weekStartLocalDate: string): DutySpan[] {
  const first = parseLocalDate(weekStartLocalDate)
  const weekStarts = localToInstant(timeZone, first, 0)
  const weekEnds = localToInstant(timeZone, addDays(first, 7), 0)
  const base = Array.from({ length: 8 }, (_, i) => i - 1).flatMap((days) => patternSpansOn(shiftsOf(roster), timeZone, addDays(first, days)))
  return applyOverrides(base, overrides)
    .filter((s) => s.endsAt > weekStarts && s.startsAt < weekEnds)
    .sort((a, b) => a.startsAt - b.startsAt || (a.userId < b.userId ? -1 : a.userId > b.userId ? 1 : 0) || a.endsAt - b.endsAt)
}
