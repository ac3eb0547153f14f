import { afterEach, describe, expect, it } from 'vitest'
import {
  formatClock,
  formatDateTime,
  formatDayTime,
  formatInZone,
  formatTimeOfDay,
  formatYear,
  formatZonedClock,
  formatZonedDateTime,
  setClockStyle,
} from '@shared/time'

// 2026-03-03 13:05 UTC is 14:05 in Berlin (CET, UTC+1).
const AT = '2026-03-03T13:05:00Z'

describe('clock style', () => {
  afterEach(() => setClockStyle('24h'))

  it('writes 24-hour times by default', () => {
    expect(formatClock(AT, 'Europe/Berlin')).toBe('14:05')
    expect(formatDateTime(AT, 'Europe/Berlin')).toBe('3 Mar, 14:05')
    expect(formatDayTime(AT, 'Europe/Berlin')).toBe('Tue 3 Mar, 14:05')
    expect(formatTimeOfDay('07:00')).toBe('07:00')
  })

  it('writes 12-hour times once the organisation chooses them, on the same site clock', () => {
    setClockStyle('12h')
    expect(formatClock(AT, 'Europe/Berlin')).toBe('2:05 pm')
    expect(formatDateTime(AT, 'Europe/Berlin')).toBe('3 Mar, 2:05 pm')
    expect(formatClock('2026-03-03T23:30:00Z', 'Europe/Berlin')).toBe('12:30 am')
    expect(formatTimeOfDay('00:00')).toBe('12:00 am')
    expect(formatTimeOfDay('07:30')).toBe('7:30 am')
    expect(formatTimeOfDay('12:00')).toBe('12:00 pm')
    expect(formatTimeOfDay('19:00')).toBe('7:00 pm')
  })

  it('follows a style passed with the call over the process-wide one, as the server does per organisation', () => {
    expect(formatClock(AT, 'Europe/Berlin', '12h')).toBe('2:05 pm')
    expect(formatZonedClock(AT, 'Europe/Berlin', '12h')).toBe('2:05 pm CET')
    expect(formatZonedDateTime(AT, 'Europe/Berlin', '12h')).toBe('3 Mar, 2:05 pm CET')
    expect(formatDayTime(AT, 'Europe/Berlin', '12h')).toBe('Tue 3 Mar, 2:05 pm')
    expect(formatInZone(AT, 'Europe/Berlin', '12h')).toBe('Tue, 3 Mar 2026, 2:05 pm GMT+1')
    expect(formatInZone(AT, 'Europe/Berlin', '24h')).toBe('Tue, 3 Mar 2026, 14:05 GMT+1')
    expect(formatTimeOfDay('15:05', '12h')).toBe('3:05 pm')
    setClockStyle('12h')
    expect(formatClock(AT, 'Europe/Berlin', '24h')).toBe('14:05')
    expect(formatDateTime(AT, 'Europe/Berlin', '24h')).toBe('3 Mar, 14:05')
    expect(formatTimeOfDay('15:05', '24h')).toBe('15:05')
  })

  it('gives the year on the zone calendar: New Year in Auckland while it is still the old year in UTC', () => {
    expect(formatYear('2026-12-31T12:00:00Z', 'Pacific/Auckland')).toBe('2027')
    expect(formatYear('2026-12-31T12:00:00Z', 'UTC')).toBe('2026')
  })
})
