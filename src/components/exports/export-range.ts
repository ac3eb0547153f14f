// Relative imports: the unit tests (server tsconfig, no @shared alias) import this file too.
import { MAX_EXPORT_DAYS } from '@shared/schemas/exports'
import { addDays, formatLocalDate, localDateAt, localToInstant, parseLocalDate } from '@shared/time/zoned'

export type RangeCheck = { from: Date; to: Date } | { error: string }

/** Whole local days `fromDay`..`toDay` (both included) in the site's zone, as the instants the API takes. */
export function rangeOfDays(fromDay: string, toDay: string, timeZone: string): RangeCheck {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(fromDay) || !/^\d{4}-\d{2}-\d{2}$/.test(toDay)) return { error: 'Choose both days.' }
  const start = parseLocalDate(fromDay)
  const end = parseLocalDate(toDay)
  const from = localToInstant(timeZone, start, 0)
  const to = localToInstant(timeZone, addDays(end, 1), 0)
  if (to <= from) return { error: 'The last day must not be before the first.' }
  if (to - from > MAX_EXPORT_DAYS * 86_400_000) return { error: `One file covers at most ${MAX_EXPORT_DAYS} days; export longer spans in parts.` }
  return { from: new Date(from), to: new Date(to) }
}

/** The last `days` local days up to today, as `YYYY-MM-DD` strings for the date fields. */
export function lastDays(days: number, timeZone: string, now = Date.now()): { fromDay: string; toDay: string } {
  const today = localDateAt(timeZone, now)
  return { fromDay: formatLocalDate(addDays(today, 1 - days)), toDay: formatLocalDate(today) }
}
