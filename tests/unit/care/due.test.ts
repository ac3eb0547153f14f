import { describe, expect, it } from 'vitest'
import { byUrgency, careDue, nextDueDate, type CareTaskTiming } from '@shared/care/due'
import { CET, CEST, EDT, euSummerEnds, euSummerStarts, HOUR_MS } from '../roster/sources'

// Offsets and change-over instants come from the law (see tests/unit/roster/sources.ts):
// Directive 2000/84/EC Art. 2–3 (EU summer time from/to 01:00 GMT on the last Sundays of March
// and October), EinhZeitG § 4 (CET = UTC+1, CEST = UTC+2), 15 U.S.C. § 260a and § 261 (US
// Eastern daylight time UTC−4 from the second Sunday in March).
const BERLIN = 'Europe/Berlin'
const NEW_YORK = 'America/New_York'
const at = (iso: string) => new Date(iso)
const weekly = (lastDoneAt: string | null, extra: Partial<CareTaskTiming> = {}): CareTaskTiming => ({
  recurrence: { kind: 'interval', everyDays: 7 },
  lastDoneAt: lastDoneAt ? at(lastDoneAt) : null,
  startsOn: null,
  createdAt: at('2026-03-01T08:00:00Z'),
  snoozedUntil: null,
  ...extra,
})

describe('care task due dates on the site calendar', () => {
  // Done Monday 2 March 2026 at 11:00 Berlin time (10:00 UTC + CET): due a week later, Monday 9 March.
  const task = weekly('2026-03-02T10:00:00Z')

  it('counts days on the Berlin calendar, not in UTC', () => {
    const beforeMidnight = new Date(Date.UTC(2026, 2, 8, 23, 30) - CET) // 23:30 on 8 March in Berlin
    expect(careDue(task, BERLIN, beforeMidnight)).toMatchObject({ dueOn: '2026-03-09', status: 'due_soon', daysUntilDue: 1, today: '2026-03-08' })
    // 23:30 UTC on 8 March is already 00:30 on 9 March in Berlin: due today there, not yet in UTC.
    expect(careDue(task, BERLIN, at('2026-03-08T23:30:00Z'))).toMatchObject({ status: 'due_today', daysUntilDue: 0, today: '2026-03-09' })
    expect(careDue(task, 'UTC', at('2026-03-08T23:30:00Z'))).toMatchObject({ status: 'due_soon', daysUntilDue: 1, today: '2026-03-08' })
    expect(careDue(task, BERLIN, at('2026-03-09T23:30:00Z'))).toMatchObject({ status: 'overdue', daysUntilDue: -1, today: '2026-03-10' })
  })

  it('takes the done day from the site zone too (done late evening UTC is the next day in Berlin)', () => {
    const doneLate = weekly('2026-03-01T23:30:00Z') // 00:30 on Monday 2 March in Berlin
    expect(nextDueDate(doneLate, BERLIN)).toEqual({ year: 2026, month: 3, day: 9 })
    expect(nextDueDate(doneLate, 'UTC')).toEqual({ year: 2026, month: 3, day: 8 })
  })

  it('keeps the calendar right across the spring change-over in Berlin', () => {
    const daily = weekly('2026-03-28T12:00:00Z', { recurrence: { kind: 'interval', everyDays: 1 } })
    const springForward = euSummerStarts(2026) // Sunday 29 March 2026, 01:00 UTC
    expect(new Date(springForward).toISOString()).toBe('2026-03-29T01:00:00.000Z')
    // 00:30 CET on Sunday 29 March: the task is due that day.
    expect(careDue(daily, BERLIN, new Date(Date.UTC(2026, 2, 29, 0, 30) - CET)).status).toBe('due_today')
    // 00:30 CEST on Monday 30 March is 22:30 UTC on the 29th; a fixed CET offset would still say Sunday 23:30.
    const mondayEarly = new Date(Date.UTC(2026, 2, 30, 0, 30) - CEST)
    expect(mondayEarly.toISOString()).toBe('2026-03-29T22:30:00.000Z')
    expect(careDue(daily, BERLIN, mondayEarly)).toMatchObject({ status: 'overdue', today: '2026-03-30' })
  })

  it('keeps the calendar right across the autumn change-over in Berlin', () => {
    const daily = weekly('2026-10-24T12:00:00Z', { recurrence: { kind: 'interval', everyDays: 1 } })
    const fallBack = euSummerEnds(2026) // Sunday 25 October 2026, 01:00 UTC
    // 23:30 CET on Sunday 25 October (after the change) is 22:30 UTC: still Sunday, due today.
    expect(careDue(daily, BERLIN, new Date(fallBack + 21.5 * HOUR_MS))).toMatchObject({ status: 'due_today', today: '2026-10-25' })
    expect(careDue(daily, BERLIN, new Date(Date.UTC(2026, 9, 26, 0, 30) - CET))).toMatchObject({ status: 'overdue', today: '2026-10-26' })
  })

  it('reads New York dates in Eastern daylight time after 8 March 2026', () => {
    // 03:30 UTC on 9 March is 23:30 EDT on 8 March: the Monday task is due tomorrow there.
    const due = careDue(weekly('2026-03-02T15:00:00Z'), NEW_YORK, new Date(Date.UTC(2026, 2, 8, 23, 30) - EDT))
    expect(due).toMatchObject({ dueOn: '2026-03-09', status: 'due_soon', today: '2026-03-08' })
  })

  it('calls two days ahead "due soon" and three "later"', () => {
    expect(careDue(task, BERLIN, at('2026-03-07T10:00:00Z'))).toMatchObject({ status: 'due_soon', daysUntilDue: 2 })
    expect(careDue(task, BERLIN, at('2026-03-06T10:00:00Z'))).toMatchObject({ status: 'later', daysUntilDue: 3 })
  })
})

describe('weekday recurrences and first due dates', () => {
  const monThu = (lastDoneAt: string | null, extra: Partial<CareTaskTiming> = {}) =>
    weekly(lastDoneAt, { recurrence: { kind: 'weekdays', weekdays: [0, 3] }, ...extra })

  it('goes Monday → Thursday → Monday', () => {
    // 2 March 2026 is a Monday (1 January 2026 was a Thursday).
    expect(nextDueDate(monThu('2026-03-02T09:00:00Z'), BERLIN)).toEqual({ year: 2026, month: 3, day: 5 })
    expect(nextDueDate(monThu('2026-03-05T09:00:00Z'), BERLIN)).toEqual({ year: 2026, month: 3, day: 9 })
    // Done late on a Tuesday: the next slot is Thursday.
    expect(nextDueDate(monThu('2026-03-03T09:00:00Z'), BERLIN)).toEqual({ year: 2026, month: 3, day: 5 })
  })

  it('starts a never-done task on its start date, else the day it was created', () => {
    expect(nextDueDate(weekly(null), BERLIN)).toEqual({ year: 2026, month: 3, day: 1 })
    expect(nextDueDate(weekly(null, { startsOn: '2026-03-20' }), BERLIN)).toEqual({ year: 2026, month: 3, day: 20 })
    // Created Sunday 1 March: the first Monday or Thursday on or after it.
    expect(nextDueDate(monThu(null), BERLIN)).toEqual({ year: 2026, month: 3, day: 2 })
  })
})

describe('snoozes and ordering', () => {
  const task = weekly('2026-03-02T10:00:00Z')

  it('moves the due date to the day the snooze ends while it runs', () => {
    const snoozed = { ...task, snoozedUntil: at('2026-03-11T10:00:00Z') }
    expect(careDue(snoozed, BERLIN, at('2026-03-10T10:00:00Z'))).toMatchObject({ dueOn: '2026-03-11', status: 'due_soon', snoozed: true })
    expect(careDue(snoozed, BERLIN, at('2026-03-12T10:00:00Z'))).toMatchObject({ dueOn: '2026-03-09', status: 'overdue', daysUntilDue: -3, snoozed: false })
  })

  it('puts the longest overdue first, then due today, soon and later', () => {
    const now = at('2026-03-10T10:00:00Z')
    const dues = ['2026-03-09T10:00:00Z', '2026-03-02T10:00:00Z', '2026-03-05T10:00:00Z', '2026-03-03T10:00:00Z'].map((d) => careDue(weekly(d), BERLIN, now))
    expect(dues.sort(byUrgency).map((d) => [d.dueOn, d.status])).toEqual([
      ['2026-03-09', 'overdue'],
      ['2026-03-10', 'due_today'],
      ['2026-03-12', 'due_soon'],
      ['2026-03-16', 'later'],
    ])
  })
})
