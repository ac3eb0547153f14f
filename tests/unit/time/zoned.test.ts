import { describe as group, expect, it } from 'vitest'
import { isValidTimeZone, localToInstant, offsetAt, parseLocalDate } from '@shared/time/zoned'
import { CEST, CET, EDT, EST, easternDaylightEnds, easternDaylightStarts, euSummerEnds, euSummerStarts, lastSunday, nthSunday, wallAt } from '../roster/sources'

const BERLIN = 'Europe/Berlin'
const NEW_YORK = 'America/New_York'

group('2026 change dates follow the published rules', () => {
  it('EU: last Sundays of March and October are 29 March and 25 October (2000/84/EC Art. 2, 3)', () => {
    expect([lastSunday(2026, 3), lastSunday(2026, 10)]).toEqual([29, 25])
  })
  it('US: second Sunday of March is 8 March, first Sunday of November is 1 November (15 U.S.C. § 260a)', () => {
    expect([nthSunday(2026, 3, 2), nthSunday(2026, 11, 1)]).toEqual([8, 1])
  })
})

group('offsetAt', () => {
  const cases: Array<[string, string, number, number]> = [
    ['Berlin, a second before summer time', BERLIN, euSummerStarts(2026) - 1000, CET],
    ['Berlin, the moment summer time begins', BERLIN, euSummerStarts(2026), CEST],
    ['Berlin, a second before summer time ends', BERLIN, euSummerEnds(2026) - 1000, CEST],
    ['Berlin, the moment summer time ends', BERLIN, euSummerEnds(2026), CET],
    ['New York, a second before daylight time', NEW_YORK, easternDaylightStarts(2026) - 1000, EST],
    ['New York, the moment daylight time begins', NEW_YORK, easternDaylightStarts(2026), EDT],
    ['New York, a second before daylight time ends', NEW_YORK, easternDaylightEnds(2026) - 1000, EDT],
    ['New York, the moment daylight time ends', NEW_YORK, easternDaylightEnds(2026), EST],
  ]
  it.each(cases)('%s', (_title, zone, atMs, expected) => {
    expect(offsetAt(zone, atMs)).toBe(expected)
  })
})

group('localToInstant', () => {
  const cases: Array<[string, string, string, string, number]> = [
    ['Berlin winter', BERLIN, '2026-01-05', '06:00', wallAt('2026-01-05T06:00', CET)],
    ['Berlin summer', BERLIN, '2026-07-06', '06:00', wallAt('2026-07-06T06:00', CEST)],
    ['Berlin: 01:59 before the gap is still CET', BERLIN, '2026-03-29', '01:59', wallAt('2026-03-29T01:59', CET)],
    ['Berlin: 02:30 does not exist and maps to the end of the gap', BERLIN, '2026-03-29', '02:30', euSummerStarts(2026)],
    ['Berlin: 03:00 is the first minute of CEST', BERLIN, '2026-03-29', '03:00', euSummerStarts(2026)],
    ['Berlin: repeated 02:30 maps to its first occurrence (CEST)', BERLIN, '2026-10-25', '02:30', wallAt('2026-10-25T02:30', CEST)],
    ['Berlin: 03:00 after the repeat is CET', BERLIN, '2026-10-25', '03:00', wallAt('2026-10-25T03:00', CET)],
    ['New York: 02:30 does not exist and maps to 03:00 EDT', NEW_YORK, '2026-03-08', '02:30', easternDaylightStarts(2026)],
    ['New York: repeated 01:30 maps to its first occurrence (EDT)', NEW_YORK, '2026-11-01', '01:30', wallAt('2026-11-01T01:30', EDT)],
    ['New York: 02:00 after the repeat is EST', NEW_YORK, '2026-11-01', '02:00', wallAt('2026-11-01T02:00', EST)],
  ]
  it.each(cases)('%s', (_title, zone, date, clock, expected) => {
    const [hours, minutes] = clock.split(':').map(Number) as [number, number]
    expect(localToInstant(zone, parseLocalDate(date), hours * 60 + minutes)).toBe(expected)
  })
})

group('input checks', () => {
  it('rejects dates that are not on the calendar', () => {
    expect(() => parseLocalDate('2026-02-30')).toThrow(RangeError)
    expect(() => parseLocalDate('5 Jan 2026')).toThrow(RangeError)
  })
  it('knows real zones from typos', () => {
    expect([isValidTimeZone('Europe/Berlin'), isValidTimeZone('Europe/Berlinn')]).toEqual([true, false])
  })
})
