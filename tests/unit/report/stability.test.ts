import { describe, expect, it } from 'vitest'
import { gapLimit, stability, type TimedValue } from '@shared/report/stability'

// Worked by hand: each reading holds its value until the next; a step longer than the gap limit
// (3 × the median step, or a stated maximum) is a gap and counts nowhere.
const MIN = 60_000
const HOUR = 60 * MIN
const T0 = Date.UTC(2026, 10, 2) // Monday 2 November 2026, 00:00 UTC
const r = (minutes: number, value: number): TimedValue => ({ at: T0 + minutes * MIN, value })
const band = { min: 24, max: 28 }

describe('stability of one metric over a period', () => {
  it('weights each value by how long it held (one hour, readings every 15 min)', () => {
    // 25 for 15 min, 27 for 15 min, 29 for 15 min (above), 26 for 15 min → 45 of 60 min in band.
    // Mean = (25 + 27 + 29 + 26) × 15 / 60 = 26.75. The reading at 60 min ends the last step.
    const s = stability({ readings: [r(0, 25), r(15, 27), r(30, 29), r(45, 26), r(60, 30)], from: T0, to: T0 + HOUR, band })
    expect(s.readings).toBe(4)
    expect(s.coveredMs).toBe(HOUR)
    expect(s.coveragePercent).toBe(100)
    expect(s.timeInBandPercent).toBe(75)
    expect(s.aboveMs).toBe(15 * MIN)
    expect(s.belowMs).toBe(0)
    expect(s.mean).toBeCloseTo(26.75, 10)
    // The 30 at 60 min lies outside the period: not in min/max.
    expect([s.min, s.max]).toEqual([25, 29])
    expect(s.gaps).toEqual([])
    expect(s.gapLimitMs).toBe(45 * MIN)
  })

  it('does not bridge a gap longer than the limit, and reports it', () => {
    // Steps 10, 10, 60, 10, 10 min: median 10, limit 30 min. 20→80 is a 60-min gap.
    // Covered: 0–20 (value 25, 26) and 80–100 (value 30, 31) plus the last reading 100→120 (20 ≤ 30 min).
    const readings = [r(0, 25), r(10, 26), r(20, 27), r(80, 30), r(90, 31), r(100, 25)]
    const s = stability({ readings, from: T0, to: T0 + 120 * MIN, band })
    expect(s.gapLimitMs).toBe(30 * MIN)
    expect(s.gaps).toEqual([{ from: T0 + 20 * MIN, to: T0 + 80 * MIN, durationMs: 60 * MIN }])
    expect(s.coveredMs).toBe(60 * MIN)
    expect(s.coveragePercent).toBe(50)
    // In band: 25 (10 min), 26 (10 min), 25 (20 min) = 40 of 60 covered min; 30 and 31 are above.
    expect(s.inBandMs).toBe(40 * MIN)
    expect(s.timeInBandPercent).toBeCloseTo((40 / 60) * 100, 10)
    // Mean over covered time only: (25·10 + 26·10 + 30·10 + 31·10 + 25·20) / 60 = 1620 / 60 = 27.
    expect(s.mean).toBeCloseTo(27, 10)
    // 27 was measured, though its step was a gap: it counts for min/max, not for time.
    expect([s.min, s.max]).toEqual([25, 31])
  })

  it('a stated maximum caps the limit', () => {
    const readings = [r(0, 25), r(30, 25), r(60, 25), r(90, 25)]
    expect(stability({ readings, from: T0, to: T0 + 120 * MIN, band, maxGapMs: 20 * MIN }).coveredMs).toBe(0)
    expect(stability({ readings, from: T0, to: T0 + 120 * MIN, band }).coveredMs).toBe(120 * MIN)
    expect(gapLimit([0, 10, 20], 5)).toBe(5)
    expect(gapLimit([0, 10, 20], null)).toBe(30)
    expect(gapLimit([0], 7)).toBe(7)
    expect(gapLimit([0], undefined)).toBeNull()
  })

  it('with no readings the whole period is one gap and every figure is empty', () => {
    const s = stability({ readings: [], from: T0, to: T0 + HOUR, band })
    expect(s).toMatchObject({ readings: 0, coveredMs: 0, coveragePercent: 0, timeInBandPercent: null, min: null, max: null, mean: null, gapLimitMs: null })
    expect(s.gaps).toEqual([{ from: T0, to: T0 + HOUR, durationMs: HOUR }])
  })

  it('one reading: no usual interval, so it covers only up to a stated maximum', () => {
    const alone = stability({ readings: [r(50, 26)], from: T0, to: T0 + HOUR, band })
    expect(alone.coveredMs).toBe(0)
    expect([alone.min, alone.max]).toEqual([26, 26])
    expect(alone.gaps).toEqual([{ from: T0, to: T0 + HOUR, durationMs: HOUR }])
    // With a 15-min maximum, 50→60 min (10 min) holds; 0→50 is before the first reading.
    const capped = stability({ readings: [r(50, 26)], from: T0, to: T0 + HOUR, band, maxGapMs: 15 * MIN })
    expect(capped.coveredMs).toBe(10 * MIN)
    expect(capped.mean).toBe(26)
    expect(capped.timeInBandPercent).toBe(100)
    expect(capped.gaps).toEqual([{ from: T0, to: T0 + 50 * MIN, durationMs: 50 * MIN }])
  })

  it('all gap: readings too far apart for a stated maximum', () => {
    const s = stability({ readings: [r(0, 7), r(40, 7.2)], from: T0, to: T0 + HOUR, band: { min: 6.5, max: 7.5 }, maxGapMs: 10 * MIN })
    expect(s.coveredMs).toBe(0)
    expect(s.timeInBandPercent).toBeNull()
    expect(s.gaps).toEqual([{ from: T0, to: T0 + HOUR, durationMs: HOUR }])
    expect([s.min, s.max]).toEqual([7, 7.2])
  })

  it('the last reading before the period holds into it; later ones only end a step', () => {
    // Readings every 20 min at −30, −10, 10 … 90; period 0–60 min. −10 (23) holds 0→10 min,
    // 10, 30 and 50 (25) hold 10→60; the reading at 70 only ends the last step.
    const readings = [r(-30, 20), r(-10, 23), r(10, 25), r(30, 25), r(50, 25), r(70, 40), r(90, 41)]
    const s = stability({ readings, from: T0, to: T0 + HOUR, band })
    expect(s.readings).toBe(3)
    expect(s.coveredMs).toBe(HOUR)
    expect(s.belowMs).toBe(10 * MIN) // the carried 23
    expect(s.inBandMs).toBe(50 * MIN)
    expect([s.min, s.max]).toEqual([23, 25]) // 20 and 40/41 held no time in the period
    expect(s.mean).toBeCloseTo((23 * 10 + 25 * 50) / 60, 10)
  })

  it('a band open on one side', () => {
    const readings = [r(0, 5), r(30, 50), r(60, 50)]
    expect(stability({ readings, from: T0, to: T0 + HOUR, band: { min: 10 } }).timeInBandPercent).toBe(50)
    expect(stability({ readings, from: T0, to: T0 + HOUR, band: { max: 10 } }).timeInBandPercent).toBe(50)
    expect(stability({ readings, from: T0, to: T0 + HOUR, band: { min: null, max: 100 } }).timeInBandPercent).toBe(100)
    const none = stability({ readings, from: T0, to: T0 + HOUR, band: null })
    expect([none.timeInBandPercent, none.inBandMs]).toEqual([null, null])
    expect(none.mean).toBeCloseTo(27.5, 10)
  })

  it('the band edges count as in band, unsorted input is sorted, and a leading stretch is a gap', () => {
    const s = stability({ readings: [r(40, 28), r(20, 24), r(30, 26)], from: T0, to: T0 + 50 * MIN, band })
    expect(s.gaps).toEqual([{ from: T0, to: T0 + 20 * MIN, durationMs: 20 * MIN }])
    expect(s.coveredMs).toBe(30 * MIN)
    expect(s.timeInBandPercent).toBe(100)
  })

  it('refuses an empty period', () => {
    expect(() => stability({ readings: [], from: T0, to: T0, band })).toThrow(RangeError)
  })
})

describe('chart series', () => {
  it('bucket means, carried values where a reading still holds, null inside a gap', async () => {
    const { chartSeries } = await import('@shared/report/series')
    // 6 buckets of 10 min over an hour. Readings at 0, 5 (bucket 0), 20 (bucket 2), 50 (bucket 5);
    // the 20→50 step is a gap, so buckets 3 and 4 (middles 35, 45) are null; bucket 1 carries 26.
    const readings = [r(0, 25), r(5, 27), r(20, 28), r(50, 24)]
    const gaps = [{ from: T0 + 20 * MIN, to: T0 + 50 * MIN, durationMs: 30 * MIN }]
    const points = chartSeries(readings, T0, T0 + HOUR, gaps, 6)
    expect(points.map(([, v]) => v)).toEqual([26, 26, 28, null, null, 24])
    expect(points[0]![0]).toBe(T0 + 5 * MIN)
  })
})
