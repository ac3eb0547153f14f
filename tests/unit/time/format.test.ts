import { describe, expect, it } from 'vitest'
import {
  formatAge,
  formatCalendarDay,
  formatClock,
  formatDateTime,
  formatDay,
  formatDuration,
  formatInZone,
  formatZonedClock,
  formatZonedDateTime,
  zoneAbbreviation,
} from '@shared/time'

// Directive 2000/84/EC of the European Parliament and of the Council on summer-time arrangements
// (19 Jan 2001): from 2002 the summer-time period ends in every Member State at 1 a.m. GMT on the
// last Sunday in October (25 Oct 2026), clocks having been put forward 60 minutes. Germany keeps
// Central European Time, UTC+1, as standard time (IANA tz database, file `europe`, Europe/Berlin).
describe('times on the site’s clock', () => {
  it('shows Berlin time on both sides of the end of summer time, naming the offset', () => {
    expect(formatInZone('2026-10-25T00:30:00Z', 'Europe/Berlin')).toBe('Sun, 25 Oct 2026, 02:30 GMT+2')
    expect(formatInZone('2026-10-25T01:30:00Z', 'Europe/Berlin')).toBe('Sun, 25 Oct 2026, 02:30 GMT+1')
  })

  // 15 U.S.C. § 260a(a), as amended by the Energy Policy Act of 2005 (Pub. L. 109-58, § 110): standard
  // time is advanced one hour from the second Sunday of March to the first Sunday of November.
  // Eastern standard time is UTC−5 (15 U.S.C. § 261, from memory), so July in New York is UTC−4.
  it('shows New York time in July as UTC−4', () => {
    expect(formatInZone('2026-07-15T12:00:00Z', 'America/New_York')).toBe('Wed, 15 Jul 2026, 08:00 GMT-4')
  })

  it('refuses a text that is not a time rather than printing "Invalid Date"', () => {
    expect(() => formatInZone('yesterday', 'Europe/Berlin')).toThrow(RangeError)
  })

  it('names the zone by its short name, summer and winter', () => {
    expect(formatZonedDateTime('2026-03-03T02:12:00Z', 'Europe/Berlin')).toBe('3 Mar, 03:12 CET')
    expect(formatZonedDateTime('2026-07-03T02:12:00Z', 'Europe/Berlin')).toBe('3 Jul, 04:12 CEST')
    expect(formatZonedClock('2026-07-03T02:12:00Z', 'Europe/Berlin')).toBe('04:12 CEST')
    expect(zoneAbbreviation('2026-07-15T12:00:00Z', 'America/New_York')).toBe('GMT-4')
  })

  it('writes clocks, days and dates the same way for a screen, a mail and a PDF', () => {
    const at = Date.parse('2026-10-25T23:30:00Z')
    expect(formatClock(at, 'Europe/Berlin')).toBe('00:30')
    expect(formatDateTime(at, 'Europe/Berlin')).toBe('26 Oct, 00:30')
    expect(formatDay(at, 'Europe/Berlin')).toBe('Mon 26 Oct')
    expect(formatCalendarDay(at, 'Europe/Berlin')).toBe('26 Oct 2026')
    expect(formatDateTime(null, 'Europe/Berlin')).toBe('—')
  })

  it('falls back to the reader’s zone for an unknown zone name instead of failing the page', () => {
    expect(formatClock('2026-03-03T02:12:00Z', 'Not/AZone')).toBe(formatClock('2026-03-03T02:12:00Z'))
  })
})

describe('lengths of time', () => {
  it('says how long something has gone on, rounded down to the minute', () => {
    expect(formatDuration(59_000)).toBe('0 min')
    expect(formatDuration(12 * 60_000 + 59_000)).toBe('12 min')
    expect(formatDuration((3 * 60 + 5) * 60_000)).toBe('3 h 05 min')
    expect(formatDuration((52 * 60 + 30) * 60_000)).toBe('2 d 4 h')
    expect(formatDuration(-5000)).toBe('0 min')
  })

  it('says how old a reading is', () => {
    const now = Date.parse('2026-03-03T12:00:00Z')
    expect(formatAge(null, now)).toBe('no readings')
    expect(formatAge('2026-03-03T11:59:30Z', now)).toBe('just now')
    expect(formatAge('2026-03-03T11:58:00Z', now)).toBe('2 min ago')
    expect(formatAge('2026-03-03T09:00:00Z', now)).toBe('3 h ago')
    expect(formatAge('2026-03-02T00:00:00Z', now)).toBe('36 h ago')
    expect(formatAge('2026-02-25T12:00:00Z', now)).toBe('6 days ago')
  })
})
