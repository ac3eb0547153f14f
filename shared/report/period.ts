// Report periods on the site's own calendar: an ISO week (Monday to Sunday) or a calendar month.
import { formatDayValue } from '../time/field-text'
import { formatDay } from '../time/format'
import { addDays, formatLocalDate, localDateAt, localToInstant, parseLocalDate, weekdayOf, type LocalDate } from '../time/zoned'

export const REPORT_PERIOD_KINDS = ['week', 'month'] as const
export type ReportPeriodKind = (typeof REPORT_PERIOD_KINDS)[number]

export type ReportPeriod = {
  kind: ReportPeriodKind
  timeZone: string
  /** First local day, `YYYY-MM-DD`. */
  startDate: string
  /** The local day after the last one, `YYYY-MM-DD` (exclusive). */
  endDate: string
  /** Local midnight at the start and at the end, as instants (ms). */
  from: number
  to: number
  /** Any day of the period before and of the one after, for navigation. */
  previousDate: string
  nextDate: string
  label: string
}

function firstOfMonth(date: LocalDate, monthsAhead = 0): LocalDate {
  const index = date.year * 12 + (date.month - 1) + monthsAhead
  return { year: Math.floor(index / 12), month: (index % 12) + 1, day: 1 }
}

const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']

/** The ISO week number and its year (the year of the week's Thursday). */
export function isoWeek(date: LocalDate): { year: number; week: number } {
  const thursday = addDays(date, 3 - weekdayOf(date))
  const jan1 = Date.UTC(thursday.year, 0, 1)
  const day = Math.round((Date.UTC(thursday.year, thursday.month - 1, thursday.day) - jan1) / 86_400_000)
  return { year: thursday.year, week: Math.floor(day / 7) + 1 }
}

/** "Mon 2 Nov to Sun 8 Nov 2026", the year said once unless the span crosses into the next. */
function daySpan(first: LocalDate, last: LocalDate): string {
  const firstText = first.year === last.year ? formatDay(`${formatLocalDate(first)}T12:00:00Z`, 'UTC') : formatDayValue(formatLocalDate(first))
  return `${firstText} to ${formatDayValue(formatLocalDate(last))}`
}

/** The period of `kind` holding the local day `date` (`YYYY-MM-DD`) in `timeZone`. */
export function reportPeriod(kind: ReportPeriodKind, date: string, timeZone: string): ReportPeriod {
  const day = parseLocalDate(date)
  let start: LocalDate
  let end: LocalDate
  let label: string
  if (kind === 'week') {
    start = addDays(day, -weekdayOf(day))
    end = addDays(start, 7)
    const { year, week } = isoWeek(start)
    label = `Week ${week} of ${year} (${daySpan(start, addDays(end, -1))})`
  } else {
    start = firstOfMonth(day)
    end = firstOfMonth(day, 1)
    label = `${MONTH_NAMES[start.month - 1]} ${start.year}`
  }
  return {
    kind,
    timeZone,
    startDate: formatLocalDate(start),
    endDate: formatLocalDate(end),
    from: localToInstant(timeZone, start, 0),
    to: localToInstant(timeZone, end, 0),
    previousDate: formatLocalDate(addDays(start, -1)),
    nextDate: formatLocalDate(end),
    label,
  }
}

/** The last whole period that ended at or before `now`. */
export function lastEndedPeriod(kind: ReportPeriodKind, now: number, timeZone: string): ReportPeriod {
  const current = reportPeriod(kind, formatLocalDate(localDateAt(timeZone, now)), timeZone)
  return reportPeriod(kind, current.previousDate, timeZone)
}

/** Local days of [startDate, endDate) as `LocalDate`s. */
export function daysOf(period: Pick<ReportPeriod, 'startDate' | 'endDate'>): LocalDate[] {
  const days: LocalDate[] = []
  for (let d = parseLocalDate(period.startDate); formatLocalDate(d) < period.endDate; d = addDays(d, 1)) days.push(d)
  return days
}

/** Scheduled reports go out at 08:00 on the site's clock, on the first day after the period. */
export const REPORT_SEND_MINUTES = 8 * 60

/** When the report of `period` is due to go out. */
export function sendTimeOf(period: ReportPeriod): number {
  return localToInstant(period.timeZone, parseLocalDate(period.endDate), REPORT_SEND_MINUTES)
}

/**
 * The report a schedule sends next and when: the last ended period unless it went out (or was
 * skipped, for a schedule made after its send time: `lastSentPeriod` is its first day), else the
 * period running now. A time already past means it goes out at the scheduler's next round.
 */
export function nextReportSend(kind: ReportPeriodKind, lastSentPeriod: string | null, now: number, timeZone: string): { period: ReportPeriod; at: number } {
  const ended = lastEndedPeriod(kind, now, timeZone)
  const period = ended.startDate === lastSentPeriod ? reportPeriod(kind, ended.nextDate, timeZone) : ended
  return { period, at: sendTimeOf(period) }
}
