import { describe, expect, it } from 'vitest'
import { tallyCareTask } from '@shared/report/care'
import { isoWeek, lastEndedPeriod, nextReportSend, reportPeriod } from '@shared/report/period'

// ISO 8601-1:2019 §5.2.4 (ISO week date): weeks start on Monday; week 1 holds the year's first
// Thursday. Offsets: Directive 2000/84/EC Art. 2–3 (EU summer time ends 01:00 UTC on the last
// Sunday of October: 25 October 2026), CET = UTC+1.
const BERLIN = 'Europe/Berlin'

describe('report periods on the site calendar', () => {
  it('a week runs Monday 00:00 to the next Monday 00:00 local time', () => {
    // Thursday 5 November 2026 → Monday 2 November to Monday 9 November (CET, UTC+1).
    const p = reportPeriod('week', '2026-11-05', BERLIN)
    expect([p.startDate, p.endDate]).toEqual(['2026-11-02', '2026-11-09'])
    expect(new Date(p.from).toISOString()).toBe('2026-11-01T23:00:00.000Z')
    expect(new Date(p.to).toISOString()).toBe('2026-11-08T23:00:00.000Z')
    expect(p.label).toBe('Week 45 of 2026 (Mon 2 Nov to Sun 8 Nov 2026)')
    expect([p.previousDate, p.nextDate]).toEqual(['2026-11-01', '2026-11-09'])
  })

  it('the week clocks go back is 169 hours long', () => {
    const p = reportPeriod('week', '2026-10-25', BERLIN) // a Sunday: the week of Monday 19 October
    expect(p.startDate).toBe('2026-10-19')
    expect((p.to - p.from) / 3_600_000).toBe(169)
  })

  it('a month runs from the 1st; December rolls into January', () => {
    const p = reportPeriod('month', '2026-12-31', BERLIN)
    expect([p.startDate, p.endDate, p.label]).toEqual(['2026-12-01', '2027-01-01', 'December 2026'])
    expect(reportPeriod('month', p.previousDate, BERLIN).startDate).toBe('2026-11-01')
  })

  it('ISO week numbers at year ends', () => {
    // 1 January 2027 is a Friday: it belongs to week 53 of 2026. 4 January 2027 starts week 1.
    expect(isoWeek({ year: 2027, month: 1, day: 1 })).toEqual({ year: 2026, week: 53 })
    expect(isoWeek({ year: 2027, month: 1, day: 4 })).toEqual({ year: 2027, week: 1 })
    // Its label names both years: Monday 28 December 2026 to Sunday 3 January 2027.
    expect(reportPeriod('week', '2027-01-01', BERLIN).label).toBe('Week 53 of 2026 (Mon 28 Dec 2026 to Sun 3 Jan 2027)')
  })

  it('the last ended period at Monday 08:00 local is the week before', () => {
    const monday8 = Date.parse('2026-11-09T07:00:00Z') // 08:00 CET
    expect(lastEndedPeriod('week', monday8, BERLIN).startDate).toBe('2026-11-02')
    expect(lastEndedPeriod('month', monday8, BERLIN).startDate).toBe('2026-10-01')
    // 23:30 UTC on Sunday 8 November is already Monday in Berlin.
    expect(lastEndedPeriod('week', Date.parse('2026-11-08T23:30:00Z'), BERLIN).startDate).toBe('2026-11-02')
    expect(lastEndedPeriod('week', Date.parse('2026-11-08T22:30:00Z'), BERLIN).startDate).toBe('2026-10-26')
  })

  it('garbage dates are refused', () => {
    expect(() => reportPeriod('week', '2026-02-30', BERLIN)).toThrow(RangeError)
  })
})

describe('when a schedule sends its next report (08:00 site time, the day after the period)', () => {
  // Saturday 5 December 2026, 12:00 CET (UTC+1): the week of 30 November runs; the week of 23
  // November ended, and its send time (Monday 30 November 08:00 CET) has passed.
  const saturdayNoon = Date.parse('2026-12-05T11:00:00Z')

  it('a schedule made after the last week went out (or was skipped) sends the running week next Monday 08:00', () => {
    const next = nextReportSend('week', '2026-11-23', saturdayNoon, BERLIN)
    expect(next.period.startDate).toBe('2026-11-30')
    expect(new Date(next.at).toISOString()).toBe('2026-12-07T07:00:00.000Z')
  })

  it('a schedule whose ended week has not gone out names that week, already due', () => {
    const next = nextReportSend('week', '2026-11-16', saturdayNoon, BERLIN)
    expect(next.period.startDate).toBe('2026-11-23')
    expect(new Date(next.at).toISOString()).toBe('2026-11-30T07:00:00.000Z')
    expect(next.at).toBeLessThan(saturdayNoon)
  })

  it('early on the Monday, before 08:00, the ended week is next, at 08:00 that day', () => {
    const mondaySeven = Date.parse('2026-12-07T06:00:00Z') // 07:00 CET
    const next = nextReportSend('week', '2026-11-23', mondaySeven, BERLIN)
    expect(next.period.startDate).toBe('2026-11-30')
    expect(new Date(next.at).toISOString()).toBe('2026-12-07T07:00:00.000Z')
  })

  it('a monthly schedule sends December on 1 January 08:00 CET', () => {
    const next = nextReportSend('month', '2026-11-01', saturdayNoon, BERLIN)
    expect(next.period.label).toBe('December 2026')
    expect(new Date(next.at).toISOString()).toBe('2027-01-01T07:00:00.000Z')
  })
})

describe('care tasks due versus done in a period', () => {
  const week = reportPeriod('week', '2026-11-02', BERLIN) // 2–8 November
  const localNoon = (day: number) => Date.parse(`2026-11-${String(day).padStart(2, '0')}T11:00:00Z`)
  const created = Date.parse('2026-10-01T08:00:00Z')

  it('weekday tasks: each chosen weekday of the week from the first day on', () => {
    const task = { recurrence: { kind: 'weekdays' as const, weekdays: [0, 3] }, startsOn: null, createdAt: created, doneAt: [localNoon(2)] }
    expect(tallyCareTask(task, week)).toEqual({ due: 2, done: 1 }) // Monday 2 and Thursday 5
    expect(tallyCareTask({ ...task, startsOn: '2026-11-04' }, week)).toEqual({ due: 1, done: 1 })
  })

  it('interval tasks: due again N days after each time done', () => {
    // Every 3 days, done 31 October → due 3 November, done then → due 6 November, not done → 2 due, 1 done.
    const task = {
      recurrence: { kind: 'interval' as const, everyDays: 3 },
      startsOn: '2026-10-31',
      createdAt: created,
      doneAt: [Date.parse('2026-10-31T10:00:00Z'), localNoon(3)],
    }
    expect(tallyCareTask(task, week)).toEqual({ due: 2, done: 1 })
    // Weekly, done 26 October → due 2 November; never done again → one due occurrence, however late.
    const weekly = {
      recurrence: { kind: 'interval' as const, everyDays: 7 },
      startsOn: '2026-10-19',
      createdAt: created,
      doneAt: [Date.parse('2026-10-19T10:00:00Z'), Date.parse('2026-10-26T10:00:00Z')],
    }
    expect(tallyCareTask(weekly, week)).toEqual({ due: 1, done: 0 })
    // A task whose first day is after the week is not due in it.
    expect(tallyCareTask({ ...weekly, startsOn: '2026-11-20', doneAt: [] }, week)).toEqual({ due: 0, done: 0 })
  })
})
