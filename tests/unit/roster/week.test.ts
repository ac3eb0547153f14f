import { describe as group, expect, it } from 'vitest'
import { shiftsInWeek } from '@shared/roster'
import type { DutySpan, RosterOverride, WeeklyShift } from '@shared/roster'
import { CEST, CET, EDT, EST, HOUR_MS, wallAt } from './sources'

const BERLIN = 'Europe/Berlin'
const NEW_YORK = 'America/New_York'
const MON = 0
const SAT = 5
const SUN = 6

// Expected UTC instants below are the local times converted with the offsets in ./sources
// (CET = UTC+1, CEST = UTC+2, EST = UTC−5, EDT = UTC−4); lengths are end minus start.
const iso = (span: DutySpan) => `${span.userId} ${new Date(span.startsAt).toISOString()} ${(span.endsAt - span.startsAt) / HOUR_MS}h`

group('shiftsInWeek', () => {
  const pattern: WeeklyShift[] = [
    { userId: 'ana', weekday: MON, start: '06:00', end: '14:00' },
    { userId: 'oto', weekday: SAT, start: '22:00', end: '06:00' },
    { userId: 'nia', weekday: SUN, start: '01:00', end: '05:00' },
  ]

  it('Berlin, week of the spring change: real instants and real lengths', () => {
    const spans = shiftsInWeek(pattern, [], BERLIN, '2026-03-23')
    expect(spans.map(iso)).toEqual(['ana 2026-03-23T05:00:00.000Z 8h', 'oto 2026-03-28T21:00:00.000Z 7h', 'nia 2026-03-29T00:00:00.000Z 3h'])
    expect(spans[0]?.startsAt).toBe(wallAt('2026-03-23T06:00', CET))
    expect(spans[1]?.endsAt).toBe(wallAt('2026-03-29T06:00', CEST))
  })

  it('Berlin, week of the autumn change', () => {
    expect(shiftsInWeek(pattern, [], BERLIN, '2026-10-19').map(iso)).toEqual([
      'ana 2026-10-19T04:00:00.000Z 8h',
      'oto 2026-10-24T20:00:00.000Z 9h',
      'nia 2026-10-24T23:00:00.000Z 5h',
    ])
  })

  it('New York, both change weeks', () => {
    const night: WeeklyShift[] = [{ userId: 'nia', weekday: SUN, start: '01:00', end: '05:00' }]
    const spring = shiftsInWeek(night, [], NEW_YORK, '2026-03-02')
    const autumn = shiftsInWeek(night, [], NEW_YORK, '2026-10-26')
    expect(spring).toEqual([{ userId: 'nia', startsAt: wallAt('2026-03-08T01:00', EST), endsAt: wallAt('2026-03-08T05:00', EDT) }])
    expect(autumn).toEqual([{ userId: 'nia', startsAt: wallAt('2026-11-01T01:00', EDT), endsAt: wallAt('2026-11-01T05:00', EST) }])
    expect(spring.map(iso)).toEqual(['nia 2026-03-08T06:00:00.000Z 3h'])
    expect(autumn.map(iso)).toEqual(['nia 2026-11-01T05:00:00.000Z 5h'])
  })

  it('includes a shift from the evening before that runs into the week, unclipped', () => {
    const sundayNight: WeeklyShift[] = [{ userId: 'dee', weekday: SUN, start: '22:00', end: '06:00' }]
    expect(shiftsInWeek(sundayNight, [], BERLIN, '2026-01-05').map(iso)).toEqual(['dee 2026-01-04T21:00:00.000Z 8h', 'dee 2026-01-11T21:00:00.000Z 8h'])
  })

  it('applies overrides: a remove splits a shift, an add appears, spans outside the week drop', () => {
    const overrides: RosterOverride[] = [
      { userId: 'ana', kind: 'remove', startsAt: '2026-01-05T10:00+01:00', endsAt: '2026-01-05T11:00+01:00' },
      { userId: 'eve', kind: 'add', startsAt: '2026-01-07T09:00+01:00', endsAt: '2026-01-07T17:00+01:00' },
      { userId: 'eve', kind: 'add', startsAt: '2026-02-07T09:00+01:00', endsAt: '2026-02-07T17:00+01:00' },
    ]
    const monday: WeeklyShift[] = [{ userId: 'ana', weekday: MON, start: '06:00', end: '14:00' }]
    expect(shiftsInWeek(monday, overrides, BERLIN, '2026-01-05').map(iso)).toEqual([
      'ana 2026-01-05T05:00:00.000Z 4h',
      'ana 2026-01-05T10:00:00.000Z 3h',
      'eve 2026-01-07T08:00:00.000Z 8h',
    ])
  })

  it("merges an add that overlaps the same person's shift", () => {
    const overrides: RosterOverride[] = [{ userId: 'ana', kind: 'add', startsAt: '2026-01-05T12:00+01:00', endsAt: '2026-01-05T16:00+01:00' }]
    const monday: WeeklyShift[] = [{ userId: 'ana', weekday: MON, start: '06:00', end: '14:00' }]
    expect(shiftsInWeek(monday, overrides, BERLIN, '2026-01-05').map(iso)).toEqual(['ana 2026-01-05T05:00:00.000Z 10h'])
  })

  it('a removed whole shift leaves nothing', () => {
    const overrides: RosterOverride[] = [{ userId: 'ana', kind: 'remove', startsAt: '2026-01-05T00:00+01:00', endsAt: '2026-01-06T00:00+01:00' }]
    const monday: WeeklyShift[] = [{ userId: 'ana', weekday: MON, start: '06:00', end: '14:00' }]
    expect(shiftsInWeek(monday, overrides, BERLIN, '2026-01-05')).toEqual([])
  })

  it('a shift wholly inside the skipped hour has no length and is left out', () => {
    const inGap: WeeklyShift[] = [{ userId: 'gap', weekday: SUN, start: '02:00', end: '02:45' }]
    expect(shiftsInWeek(inGap, [], BERLIN, '2026-03-23')).toEqual([])
  })

  it('rejects a week start that is not a date', () => {
    expect(() => shiftsInWeek(pattern, [], BERLIN, '2026-13-01')).toThrow(RangeError)
  })
})
