import { describe, expect, it } from 'vitest'
import { formatClockValue, formatDayValue, parseClockText, parseDayText } from '@shared/time'

describe('date field text', () => {
  it('shows a calendar date as the product writes days', () => {
    expect(formatDayValue('2026-03-03')).toBe('Tue 3 Mar 2026')
    expect(formatDayValue('')).toBe('')
  })

  it('reads ISO dates, day-first numbers and month names, and what it shows', () => {
    expect(parseDayText('2026-03-03')).toBe('2026-03-03')
    expect(parseDayText('3/3/2026')).toBe('2026-03-03')
    expect(parseDayText('25.12.26')).toBe('2026-12-25')
    expect(parseDayText('3 Mar 2026')).toBe('2026-03-03')
    expect(parseDayText('Tue 3 March, 2026')).toBe('2026-03-03')
    expect(parseDayText(formatDayValue('2028-02-29'))).toBe('2028-02-29')
    expect(parseDayText('7 Jun', 2027)).toBe('2027-06-07')
  })

  it('refuses days that do not exist and text that is no date', () => {
    expect(parseDayText('31/2/2026')).toBeNull()
    expect(parseDayText('29 Feb 2026')).toBeNull()
    expect(parseDayText('3 Smarch 2026')).toBeNull()
    expect(parseDayText('tomorrow')).toBeNull()
    expect(parseDayText('')).toBeNull()
  })
})

describe('time field text', () => {
  it('shows a time of day on the organisation clock', () => {
    expect(formatClockValue('15:05', '24h')).toBe('15:05')
    expect(formatClockValue('15:05', '12h')).toBe('3:05 pm')
    expect(formatClockValue('00:30', '12h')).toBe('12:30 am')
    expect(formatClockValue('', '12h')).toBe('')
  })

  it('reads either clock, whichever the organisation shows', () => {
    expect(parseClockText('15:05')).toBe('15:05')
    expect(parseClockText('1505')).toBe('15:05')
    expect(parseClockText('7')).toBe('07:00')
    expect(parseClockText('3:05 pm')).toBe('15:05')
    expect(parseClockText('3:05 PM')).toBe('15:05')
    expect(parseClockText('3pm')).toBe('15:00')
    expect(parseClockText('3.05 p.m.')).toBe('15:05')
    expect(parseClockText('12 am')).toBe('00:00')
    expect(parseClockText('12:15 pm')).toBe('12:15')
  })

  it('refuses times that do not exist', () => {
    expect(parseClockText('24:00')).toBeNull()
    expect(parseClockText('13 pm')).toBeNull()
    expect(parseClockText('0 am')).toBeNull()
    expect(parseClockText('10:75')).toBeNull()
    expect(parseClockText('noon')).toBeNull()
  })
})
