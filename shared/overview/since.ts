// Where the owner's overview starts counting: the end of yesterday's working day on the site's clock.
import { addDays, localDateAt, localToInstant, minutesOfClock } from '../time/zoned'

/** Used while a site names no end of its working day. */
export const DEFAULT_WORKDAY_END = '18:00'

/** The instant yesterday's working day ended at the site, `end` (HH:MM) on the site's calendar. */
export function endOfYesterdaysWorkday(timeZone: string, nowMs: number, end = DEFAULT_WORKDAY_END): number {
  const yesterday = addDays(localDateAt(timeZone, nowMs), -1)
  return localToInstant(timeZone, yesterday, minutesOfClock(end))
}

/** Whole minutes from opening to acknowledgement, rounded to the nearest; null while unacknowledged. */
export function minutesToAcknowledge(openedAt: Date, acknowledgedAt: Date | null): number | null {
  if (!acknowledgedAt) return null
  return Math.max(0, Math.round((acknowledgedAt.getTime() - openedAt.getTime()) / 60_000))
}
