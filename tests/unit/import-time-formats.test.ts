import { describe, expect, it } from 'vitest'
import { checkReading } from '../../server/readings/validate-readings'
import { reasonOf } from '../../server/imports/row-reader'
import { detectDelimiter, guessMetric } from '../../server/imports/sniff'
import { createTimeReader, detectTimeFormat } from '../../server/imports/time-formats'

const iso = (ms: number | null) => (ms === null ? null : new Date(ms).toISOString())

describe('time readers', () => {
  // EU clocks change on the last Sunday of March and October at 01:00 UTC (Directive 2000/84/EC, 2001):
  // 29 March and 25 October in 2026.
  const berlin = createTimeReader('local_ymd', 'Europe/Berlin')
  it('reads local Berlin times on both sides of the spring change', () => {
    expect(iso(berlin('2026-03-29 01:30'))).toBe('2026-03-29T00:30:00.000Z')
    expect(iso(berlin('2026-03-29 03:30:15'))).toBe('2026-03-29T01:30:15.000Z')
  })
  it('reads the repeated autumn hour as its first occurrence', () => {
    expect(iso(berlin('2026-10-25 02:30'))).toBe('2026-10-25T00:30:00.000Z')
    expect(iso(berlin('2026-10-25 03:30'))).toBe('2026-10-25T02:30:00.000Z')
  })
  it('refuses impossible dates and clock times', () => {
    expect(berlin('2026-02-30 10:00')).toBeNull()
    expect(berlin('2026-01-01 24:00')).toBeNull()
    expect(createTimeReader('local_dmy', 'UTC')('31/04/2026 10:00')).toBeNull()
  })
  it('reads ISO offsets, epoch seconds and milliseconds', () => {
    const read = createTimeReader('iso_offset')
    expect(iso(read('2026-03-01T14:05:00+0100'))).toBe('2026-03-01T13:05:00.000Z')
    expect(iso(read('2026-03-01 14:05Z'))).toBe('2026-03-01T14:05:00.000Z')
    expect(read('2026-03-01T14:05:00')).toBeNull()
    expect(createTimeReader('epoch_s')('1772370300')).toBe(1772370300_000)
    expect(createTimeReader('epoch_ms')('1772370300123')).toBe(1772370300123)
  })
})

describe('detection', () => {
  it('leaves day-first against month-first open until a cell decides it', () => {
    expect(detectTimeFormat(['03/04/2026', '05/06/2026'])!.ambiguousDayOrder).toBe(true)
    expect(detectTimeFormat(['03/04/2026', '05/13/2026'])!.candidates).toEqual(['local_mdy'])
  })
  it('is not thrown by a stray bad cell, but gives up on a column that is mostly not times', () => {
    expect(detectTimeFormat(['2026-03-01T10:00:00Z', 'yesterday', '2026-03-01T10:01:00Z'])!.candidates).toEqual(['iso_offset'])
    expect(detectTimeFormat(['25.1', '25.2', '2026-03-01T10:00:00Z'])).toBeNull()
  })
  it('finds the delimiter and guesses metrics and units from headers', () => {
    expect(detectDelimiter('a;b;c\n1;2,5;3\n')).toBe(';')
    expect(detectDelimiter('a\tb\n1\t2\n')).toBe('\t')
    expect(guessMetric('Water temp (°F)')).toEqual({ metric: 'temperature', unit: 'F' })
    expect(guessMetric('Conductivity mS/cm')).toEqual({ metric: 'conductivity', unit: 'mS/cm' })
    expect(guessMetric('Comment')).toBeNull()
  })
})

describe('report reasons', () => {
  it("sorts the ingest checker's reasons into report codes", () => {
    const limits = { maxFutureSeconds: 300, maxAgeDays: 400 }
    const now = Date.parse('2026-12-01T00:00:00Z')
    const reason = (r: object) => {
      const checked = checkReading(r, limits, now)
      return checked.ok ? 'ok' : reasonOf(checked.reason)
    }
    expect(reason({ metric: 'ph', value: 15, time: '2026-11-30T00:00:00Z' })).toBe('implausible_value')
    expect(reason({ metric: 'ph', value: 7, time: '2026-12-02T00:00:00Z' })).toBe('time_in_future')
    expect(reason({ metric: 'ph', value: 7, time: '2024-01-01T00:00:00Z' })).toBe('too_old')
    expect(reason({ metric: 'ph', value: 7, unit: 'K', time: '2026-11-30T00:00:00Z' })).toBe('invalid')
  })
})
