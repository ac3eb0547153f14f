// When a care task is next due and how urgent it is, on the site's own calendar.
import { addDays, formatLocalDate, localDateAt, parseLocalDate, weekdayOf, type LocalDate } from '../time/zoned'

/** Every N days after the last time it was done, or on fixed weekdays (0 = Monday … 6 = Sunday). */
export type CareRecurrence = { kind: 'interval'; everyDays: number } | { kind: 'weekdays'; weekdays: number[] }

export type CareDueStatus = 'overdue' | 'due_today' | 'due_soon' | 'later'

/** A task due within this many days after today is "due soon". */
export const DUE_SOON_DAYS = 2

export interface CareTaskTiming {
  recurrence: CareRecurrence
  lastDoneAt: Date | null
  /** First due date of a task never done, `YYYY-MM-DD` on the site's calendar; else the day it was created. */
  startsOn: string | null
  createdAt: Date
  snoozedUntil: Date | null
}

export interface CareDue {
  /** `YYYY-MM-DD` in the site's zone. */
  dueOn: string
  status: CareDueStatus
  /** Positive when due later, 0 today, negative when overdue. */
  daysUntilDue: number
  snoozed: boolean
  /** Today on the site's calendar, `YYYY-MM-DD`. */
  today: string
}

const DAY_MS = 86_400_000
const dayNumber = (d: LocalDate) => Math.round(Date.UTC(d.year, d.month - 1, d.day) / DAY_MS)
export const daysBetween = (from: LocalDate, to: LocalDate) => dayNumber(to) - dayNumber(from)

/** The first date on or after `from` that falls on one of `weekdays`. */
function nextWeekdayFrom(from: LocalDate, weekdays: readonly number[]): LocalDate {
  if (!weekdays.length) throw new RangeError('weekdays must name at least one day')
  for (let i = 0; i < 7; i++) {
    const candidate = addDays(from, i)
    if (weekdays.includes(weekdayOf(candidate))) return candidate
  }
  throw new RangeError(`weekdays must be 0 (Monday) to 6 (Sunday), got ${weekdays.join(', ')}`)
}

/** The date a task falls due by its recurrence alone (no snooze). */
export function nextDueDate(task: Omit<CareTaskTiming, 'snoozedUntil'>, timeZone: string): LocalDate {
  const { recurrence } = task
  if (task.lastDoneAt) {
    const doneOn = localDateAt(timeZone, task.lastDoneAt.getTime())
    if (recurrence.kind === 'interval') return addDays(doneOn, recurrence.everyDays)
    return nextWeekdayFrom(addDays(doneOn, 1), recurrence.weekdays)
  }
  const anchor = task.startsOn ? parseLocalDate(task.startsOn) : localDateAt(timeZone, task.createdAt.getTime())
  return recurrence.kind === 'interval' ? anchor : nextWeekdayFrom(anchor, recurrence.weekdays)
}

export function statusForDays(daysUntilDue: number): CareDueStatus {
  if (daysUntilDue < 0) return 'overdue'
  if (daysUntilDue === 0) return 'due_today'
  return daysUntilDue <= DUE_SOON_DAYS ? 'due_soon' : 'later'
}

/**
 * Due date and status at `now`, all on the site's calendar: at 23:30 UTC it is already
 * tomorrow in Berlin, so a task due tomorrow there is due today. A snooze moves the due date
 * to the day the snooze ends, if that is later.
 */
export function careDue(task: CareTaskTiming, timeZone: string, now: Date): CareDue {
  const today = localDateAt(timeZone, now.getTime())
  let due = nextDueDate(task, timeZone)
  const snoozed = task.snoozedUntil !== null && task.snoozedUntil.getTime() > now.getTime()
  if (snoozed) {
    const snoozeEnds = localDateAt(timeZone, (task.snoozedUntil as Date).getTime())
    if (daysBetween(due, snoozeEnds) > 0) due = snoozeEnds
  }
  const daysUntilDue = daysBetween(today, due)
  return { dueOn: formatLocalDate(due), status: statusForDays(daysUntilDue), daysUntilDue, snoozed, today: formatLocalDate(today) }
}

const STATUS_ORDER: Record<CareDueStatus, number> = { overdue: 0, due_today: 1, due_soon: 2, later: 3 }

/** Overdue first (longest overdue first), then due today, soon, later. */
export function byUrgency(a: CareDue, b: CareDue): number {
  return STATUS_ORDER[a.status] - STATUS_ORDER[b.status] || a.daysUntilDue - b.daysUntilDue
}
