// How many times a care task fell due in a report period, and how many times it was done.
import type { CareRecurrence } from '../care/due'
import { addDays, formatLocalDate, localDateAt, parseLocalDate, weekdayOf, type LocalDate } from '../time/zoned'
import { daysOf, type ReportPeriod } from './period'

export type CareTaskHistory = {
  recurrence: CareRecurrence
  /** First due day of a task never done, `YYYY-MM-DD`; else the day it was created counts. */
  startsOn: string | null
  createdAt: number
  /** Every time it was marked done (ms), any order, including before the period. */
  doneAt: readonly number[]
}

export type CareTaskTally = { due: number; done: number }

/**
 * Weekday tasks fall due on each of their weekdays from their first day on. Interval tasks fall
 * due on their first day, then `everyDays` after each time they were done; a task not done stays
 * one due occurrence however late it runs.
 */
export function tallyCareTask(task: CareTaskHistory, period: ReportPeriod): CareTaskTally {
  const zone = period.timeZone
  const anchor: LocalDate = task.startsOn ? parseLocalDate(task.startsOn) : localDateAt(zone, task.createdAt)
  const anchorText = formatLocalDate(anchor)
  const done = task.doneAt.filter((t) => t >= period.from && t < period.to).length
  const { recurrence } = task
  if (recurrence.kind === 'weekdays') {
    const due = daysOf(period).filter((d) => formatLocalDate(d) >= anchorText && recurrence.weekdays.includes(weekdayOf(d))).length
    return { due, done }
  }
  const doneDays = [...task.doneAt].sort((a, b) => a - b).map((t) => localDateAt(zone, t))
  let dueDay = anchor
  let due = 0
  for (let i = 0; formatLocalDate(dueDay) < period.endDate; i++) {
    if (formatLocalDate(dueDay) >= period.startDate) due++
    const doneDay = doneDays[i]
    if (!doneDay) break
    dueDay = addDays(doneDay, recurrence.everyDays)
  }
  return { due, done }
}
