import { describe as group, expect, it } from 'vitest'
import { onDutyAt } from '@shared/roster'
import type { RosterOverride, WeeklyShift } from '@shared/roster'
import { CEST, CET, EDT, EST, HOUR_MS, euSummerEnds, euSummerStarts, wallAt } from './sources'

const BERLIN = 'Europe/Berlin'
const NEW_YORK = 'America/New_York'
const MON = 0
const TUE = 1
const SAT = 5
const SUN = 6

// Week of Monday 5 January 2026, winter time in Berlin (CET).
const pattern: WeeklyShift[] = [
  { userId: 'ana', weekday: MON, start: '06:00', end: '14:00' },
  { userId: 'ben', weekday: MON, start: '14:00', end: '22:00' },
  { userId: 'cai', weekday: MON, start: '22:00', end: '06:00' },
  { userId: 'dee', weekday: SUN, start: '22:00', end: '06:00' },
]
const cet = (local: string) => wallAt(local, CET)

group('weekly pattern', () => {
  const cases: Array<[string, string, string[]]> = [
    ['Sunday night shift still running on Monday morning', '2026-01-05T05:59', ['dee']],
    ['handover: the outgoing shift ends as the next begins', '2026-01-05T06:00', ['ana']],
    ['last minute of the early shift', '2026-01-05T13:59', ['ana']],
    ['afternoon shift', '2026-01-05T14:00', ['ben']],
    ['night shift before midnight', '2026-01-05T23:00', ['cai']],
    ['night shift after midnight, on Tuesday', '2026-01-06T05:59', ['cai']],
    ['nobody on Tuesday morning', '2026-01-06T06:00', []],
    ['nobody on Sunday evening before the night shift', '2026-01-11T21:59', []],
    ['the same Sunday night shift a week later', '2026-01-11T22:00', ['dee']],
  ]
  it.each(cases)('%s (%s)', (_title, local, expected) => {
    expect(onDutyAt(pattern, [], BERLIN, cet(local))).toEqual(expected)
  })

  it('takes a roster object as well as a bare pattern', () => {
    expect(onDutyAt({ shifts: pattern }, [], BERLIN, cet('2026-01-05T10:00'))).toEqual(['ana'])
  })

  it('reads the pattern in the site zone, not UTC', () => {
    // 05:30 UTC is 06:30 in Berlin (CET) but 00:30 in New York (EST).
    const atMs = Date.parse('2026-01-05T05:30:00Z')
    expect(onDutyAt(pattern, [], BERLIN, atMs)).toEqual(['ana'])
    expect(onDutyAt(pattern, [], NEW_YORK, atMs)).toEqual(['dee'])
  })

  it('a shift whose end equals its start lasts a full day', () => {
    const allDay: WeeklyShift[] = [{ userId: 'ana', weekday: MON, start: '08:00', end: '08:00' }]
    expect(onDutyAt(allDay, [], BERLIN, cet('2026-01-06T07:59'))).toEqual(['ana'])
    expect(onDutyAt(allDay, [], BERLIN, cet('2026-01-06T08:00'))).toEqual([])
  })

  it('an empty roster has nobody on duty', () => {
    expect(onDutyAt([], [], BERLIN, cet('2026-01-05T10:00'))).toEqual([])
  })
})

group('overrides', () => {
  const add = (userId: string, startsAt: string, endsAt: string): RosterOverride => ({ userId, startsAt, endsAt, kind: 'add' })
  const remove = (userId: string, startsAt: string, endsAt: string): RosterOverride => ({ userId, startsAt, endsAt, kind: 'remove' })
  const cases: Array<[string, RosterOverride[], string, string[]]> = [
    ['remove takes a person off during the span', [remove('ana', '2026-01-05T08:00+01:00', '2026-01-05T12:00+01:00')], '2026-01-05T10:00', []],
    ['and puts them back after it', [remove('ana', '2026-01-05T08:00+01:00', '2026-01-05T12:00+01:00')], '2026-01-05T12:00', ['ana']],
    ['add puts someone on duty on a day with no shifts', [add('eve', '2026-01-06T09:00+01:00', '2026-01-06T17:00+01:00')], '2026-01-06T10:00', ['eve']],
    ['add alongside a regular shift lists both, sorted', [add('abe', '2026-01-05T20:00+01:00', '2026-01-05T23:00+01:00')], '2026-01-05T21:00', ['abe', 'ben']],
    [
      'remove wins where it overlaps an add',
      [add('eve', '2026-01-06T09:00+01:00', '2026-01-06T17:00+01:00'), remove('eve', '2026-01-06T12:00+01:00', '2026-01-06T13:00+01:00')],
      '2026-01-06T12:30',
      [],
    ],
    ['remove for someone else changes nothing', [remove('ben', '2026-01-05T08:00+01:00', '2026-01-05T12:00+01:00')], '2026-01-05T10:00', ['ana']],
    ['overrides given in UTC', [remove('ana', '2026-01-05T07:00:00Z', '2026-01-05T11:00:00Z')], '2026-01-05T10:00', []],
    [
      'a swap: one off, another on',
      [remove('cai', '2026-01-05T22:00+01:00', '2026-01-06T06:00+01:00'), add('eve', '2026-01-05T22:00+01:00', '2026-01-06T06:00+01:00')],
      '2026-01-06T02:00',
      ['eve'],
    ],
  ]
  it.each(cases)('%s', (_title, overrides, local, expected) => {
    expect(onDutyAt(pattern, overrides, BERLIN, cet(local))).toEqual(expected)
  })

  it('refuses a date-time without an offset', () => {
    expect(() => onDutyAt(pattern, [add('eve', '2026-01-06T09:00', '2026-01-06T17:00')], BERLIN, cet('2026-01-06T10:00'))).toThrow(RangeError)
  })
})

group('across daylight-saving changes', () => {
  const night: WeeklyShift[] = [{ userId: 'nia', weekday: SUN, start: '01:00', end: '05:00' }]

  it('Berlin spring: 01:00–05:00 on 29 March 2026 covers 3 real hours', () => {
    const starts = wallAt('2026-03-29T01:00', CET)
    const ends = wallAt('2026-03-29T05:00', CEST)
    expect(ends - starts).toBe(3 * HOUR_MS)
    expect(onDutyAt(night, [], BERLIN, starts - 1000)).toEqual([])
    expect(onDutyAt(night, [], BERLIN, starts)).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, euSummerStarts(2026))).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, ends - 1000)).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, ends)).toEqual([])
  })

  it('Berlin autumn: 01:00–05:00 on 25 October 2026 covers 5 real hours', () => {
    const starts = wallAt('2026-10-25T01:00', CEST)
    const ends = wallAt('2026-10-25T05:00', CET)
    expect(ends - starts).toBe(5 * HOUR_MS)
    expect(onDutyAt(night, [], BERLIN, starts)).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, euSummerEnds(2026) + 30 * 60_000)).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, ends - 1000)).toEqual(['nia'])
    expect(onDutyAt(night, [], BERLIN, ends)).toEqual([])
  })

  it('New York spring: 8 March 2026, 01:00 EST to 05:00 EDT', () => {
    const ends = wallAt('2026-03-08T05:00', EDT)
    expect(onDutyAt(night, [], NEW_YORK, wallAt('2026-03-08T01:00', EST))).toEqual(['nia'])
    expect(onDutyAt(night, [], NEW_YORK, ends - 1000)).toEqual(['nia'])
    expect(onDutyAt(night, [], NEW_YORK, ends)).toEqual([])
  })

  it('New York autumn: 1 November 2026, 01:00 EDT to 05:00 EST', () => {
    const ends = wallAt('2026-11-01T05:00', EST)
    expect(onDutyAt(night, [], NEW_YORK, wallAt('2026-11-01T01:00', EDT) - 1000)).toEqual([])
    expect(onDutyAt(night, [], NEW_YORK, wallAt('2026-11-01T01:30', EST))).toEqual(['nia'])
    expect(onDutyAt(night, [], NEW_YORK, ends - 1000)).toEqual(['nia'])
    expect(onDutyAt(night, [], NEW_YORK, ends)).toEqual([])
  })

  it('a Saturday night shift across the Berlin spring change ends at 06:00 CEST', () => {
    const overnight: WeeklyShift[] = [{ userId: 'oto', weekday: SAT, start: '22:00', end: '06:00' }]
    expect(onDutyAt(overnight, [], BERLIN, wallAt('2026-03-29T05:59', CEST))).toEqual(['oto'])
    expect(onDutyAt(overnight, [], BERLIN, wallAt('2026-03-29T06:00', CEST))).toEqual([])
  })

  it('a Tuesday shift is untouched by the Sunday change', () => {
    const tuesday: WeeklyShift[] = [{ userId: 'ana', weekday: TUE, start: '09:00', end: '17:00' }]
    expect(onDutyAt(tuesday, [], BERLIN, wallAt('2026-03-31T09:00', CEST))).toEqual(['ana'])
    expect(onDutyAt(tuesday, [], BERLIN, wallAt('2026-03-31T08:59', CEST))).toEqual([])
  })
})
