import { addDays, localDateAt, localToInstant, weekdayOf } from '../time/zoned'

/** A maintenance window as the engine and the screens read it. Weekly ones are in the site's zone. */
export interface MaintenanceSpan {
  startsAt?: number | null
  endsAt?: number | null
  /** 0 = Monday … 6 = Sunday, as the roster. */
  weekday?: number | null
  /** Minutes after local midnight. */
  startMinute?: number | null
  durationMinutes?: number | null
  cancelledAt?: number | null
}

/**
 * The occurrence of a window that covers `atMs`, as [start, end) instants, or null. A weekly
 * window is placed on the local calendar of the site's zone each week, so "Tuesday 09:00" stays
 * at 09:00 on the wall clock across the change to and from summer time.
 */
export function occurrenceAt(w: MaintenanceSpan, atMs: number, timeZone: string): [number, number] | null {
  if (w.cancelledAt != null && w.cancelledAt <= atMs) return null
  if (w.startsAt != null && w.endsAt != null) return atMs >= w.startsAt && atMs < w.endsAt ? [w.startsAt, w.endsAt] : null
  if (w.weekday == null || w.startMinute == null || w.durationMinutes == null) return null
  const today = localDateAt(timeZone, atMs)
  // A window may run past midnight: it can have started on the day before (or up to a day before).
  for (const back of [0, 1]) {
    const day = addDays(today, -back)
    if (weekdayOf(day) !== w.weekday) continue
    const start = localToInstant(timeZone, day, w.startMinute)
    const end = start + w.durationMinutes * 60_000
    if (atMs >= start && atMs < end) return [start, end]
  }
  return null
}

export const windowCovers = (w: MaintenanceSpan, atMs: number, timeZone: string) => occurrenceAt(w, atMs, timeZone) !== null

/** The occurrences of a window that overlap [fromMs, toMs), oldest first: for a week on the roster. */
export function occurrencesBetween(w: MaintenanceSpan, fromMs: number, toMs: number, timeZone: string): Array<[number, number]> {
  if (w.startsAt != null && w.endsAt != null) return w.startsAt < toMs && w.endsAt > fromMs ? [[w.startsAt, w.endsAt]] : []
  if (w.weekday == null || w.startMinute == null || w.durationMinutes == null) return []
  const out: Array<[number, number]> = []
  let day = addDays(localDateAt(timeZone, fromMs), -1)
  // Ranges are at most about two months (the API caps them), so at most ~64 days to walk.
  for (let i = 0; i < 70 && localToInstant(timeZone, day, 0) < toMs; i++, day = addDays(day, 1)) {
    if (weekdayOf(day) !== w.weekday) continue
    const start = localToInstant(timeZone, day, w.startMinute)
    const end = start + w.durationMinutes * 60_000
    if (start < toMs && end > fromMs && (w.cancelledAt == null || start < w.cancelledAt)) out.push([start, end])
  }
  return out
}
