import { describe, expect, it } from 'vitest'
import { attachment, exportFileName, zonedFormatter } from '../../../server/exports/format'
import { lastDays, rangeOfDays } from '../../../src/components/exports/export-range'

// Offsets from the IANA time zone database (tzdata, Eggert et al., 2024 release) as read through
// Intl: Europe/London changes on the last Sundays of March and October at 01:00 UTC (Summer Time
// Act 1972 with Directive 2000/84/EC); Asia/Kathmandu keeps +05:45 all year; Australia/Lord_Howe moves
// by only 30 minutes, +10:30 to +11:00, on the first Sunday of October at 02:00 local time.
describe('zoned times', () => {
  it('writes the offset in force at each instant around the London changes of 2026', () => {
    const london = zonedFormatter('Europe/London')
    expect(london(new Date('2026-03-29T00:59:59Z'))).toBe('2026-03-29T00:59:59+00:00')
    expect(london(new Date('2026-03-29T01:00:00Z'))).toBe('2026-03-29T02:00:00+01:00')
    expect(london(new Date('2026-10-25T00:59:59.5Z'))).toBe('2026-10-25T01:59:59.500+01:00')
    expect(london(new Date('2026-10-25T01:00:00Z'))).toBe('2026-10-25T01:00:00+00:00')
  })

  it('handles quarter- and half-hour offsets, and west of Greenwich', () => {
    expect(zonedFormatter('Asia/Kathmandu')(new Date('2026-07-01T00:00:00Z'))).toBe('2026-07-01T05:45:00+05:45')
    const lordHowe = zonedFormatter('Australia/Lord_Howe')
    expect(lordHowe(new Date('2026-10-03T15:29:00Z'))).toBe('2026-10-04T01:59:00+10:30')
    expect(lordHowe(new Date('2026-10-03T15:30:00Z'))).toBe('2026-10-04T02:30:00+11:00')
    expect(zonedFormatter('America/New_York')(new Date('2026-01-15T03:04:05Z'))).toBe('2026-01-14T22:04:05-05:00')
  })

  it('gives the same answer from its cache as on first sight, in any order', () => {
    const london = zonedFormatter('Europe/London')
    const instants = ['2026-10-25T01:14:00Z', '2026-10-25T00:46:00Z', '2026-10-25T01:14:00Z', '2026-10-25T00:46:00Z']
    expect(instants.map((i) => london(new Date(i)))).toEqual([
      '2026-10-25T01:14:00+00:00',
      '2026-10-25T01:46:00+01:00',
      '2026-10-25T01:14:00+00:00',
      '2026-10-25T01:46:00+01:00',
    ])
    expect(london(null)).toBe('')
  })
})

describe('download names', () => {
  it('keeps only lower-case letters, digits and dashes', () => {
    expect(exportFileName(['tankwarden', 'readings', '../../etc/passwd"; x=1', '2026-03-01'], 'csv')).toBe('tankwarden-readings-etc-passwd-x-1-2026-03-01.csv')
    // Accents fold away (ü → u, № → no); a letter with no ASCII form (ß) becomes a dash.
    expect(exportFileName(['Süßwasser Becken №3'], 'csv')).toBe('su-wasser-becken-no3.csv')
    expect(exportFileName(['💧', '=+@'], 'json')).toBe('export.json')
    expect(attachment('a-b.csv')).toBe('attachment; filename="a-b.csv"')
  })
})

describe('the range of whole local days', () => {
  it('runs from local midnight of the first day to local midnight after the last', () => {
    expect(rangeOfDays('2026-03-29', '2026-03-29', 'Europe/London')).toEqual({
      from: new Date('2026-03-29T00:00:00Z'),
      to: new Date('2026-03-29T23:00:00Z'),
    })
    expect(rangeOfDays('2026-03-02', '2026-03-01', 'UTC')).toEqual({ error: 'The last day must not be before the first.' })
    expect(rangeOfDays('2025-01-01', '2026-01-01', 'UTC')).toEqual({ from: new Date('2025-01-01T00:00:00Z'), to: new Date('2026-01-02T00:00:00Z') })
    expect(rangeOfDays('2025-01-01', '2026-01-02', 'UTC')).toEqual({ error: 'One file covers at most 366 days; export longer spans in parts.' })
    expect(rangeOfDays('', '2026-01-01', 'UTC')).toEqual({ error: 'Choose both days.' })
  })

  it('counts the last days up to today in the site zone', () => {
    // 23:30 UTC on 31 March is already 1 April in Berlin (+02:00).
    expect(lastDays(7, 'Europe/Berlin', Date.parse('2026-03-31T23:30:00Z'))).toEqual({ fromDay: '2026-03-26', toDay: '2026-04-01' })
  })
})
