import { describe, expect, it } from 'vitest'
import { localMinutesOfDay } from '../../../simulator/model/clock'
import { BASELINE_PH, crashOffset, CRASH_DURATION_S } from '../../../simulator/model/ph'
import { HOUR_S, sample, simulate, WINTER_MIDNIGHT_BERLIN } from './fixtures'

const planted = { kind: 'planted' as const, lightSchedule: { on: '10:00', off: '18:00' } }

function oneDay(overrides: Parameters<typeof simulate>[0]) {
  const sim = simulate(overrides)
  sim.advance(3 * 24 * HOUR_S)
  return sample(sim, 24 * HOUR_S, 600, () => ({ ph: sim.snapshot().ph, minute: localMinutesOfDay(sim.snapshot().simMs, 'Europe/Berlin') }))
}

describe('pH day–night swing', () => {
  it('swings about ±0.2 in a planted tank, highest at the end of the photoperiod', () => {
    const day = oneDay(planted)
    const values = day.map((d) => d.ph)
    const range = Math.max(...values) - Math.min(...values)
    expect(range).toBeGreaterThan(0.3)
    expect(range).toBeLessThan(0.5)
    const peak = day.find((d) => d.ph === Math.max(...values))!
    expect(peak.minute).toBeGreaterThanOrEqual(14 * 60)
    expect(peak.minute).toBeLessThanOrEqual(19 * 60)
    const meanOf = (from: number, to: number) => {
      const inside = day.filter((d) => d.minute >= from * 60 && d.minute < to * 60).map((d) => d.ph)
      return inside.reduce((a, b) => a + b, 0) / inside.length
    }
    expect(meanOf(14, 18) - meanOf(0, 10)).toBeGreaterThan(0.3)
    const mean = values.reduce((a, b) => a + b, 0) / values.length
    expect(Math.abs(mean - BASELINE_PH.planted)).toBeLessThan(0.2)
  })

  it('follows the lights on the wall clock when the simulator runs faster (a demo at 20×)', () => {
    const SPEED = 20
    const sim = simulate(planted, { speed: SPEED })
    const wallMinute = () => localMinutesOfDay(WINTER_MIDNIGHT_BERLIN + (sim.snapshot().simMs - WINTER_MIDNIGHT_BERLIN) / SPEED, 'Europe/Berlin')
    // From 17:40 to 18:10 on the wall clock, across the lights going off at 18:00.
    sim.advance((17 * 60 + 40) * 60 * SPEED)
    expect(wallMinute()).toBe(17 * 60 + 40)
    const before = sim.snapshot().ph
    sim.advance(30 * 60 * SPEED)
    const drop = before - sim.snapshot().ph
    // A 90-minute time constant on the wall clock moves the swing about a fifth of its 0.4 in half
    // an hour (1 − e^(−30/90) ≈ 0.28 at most); 600 simulated minutes would move nearly all of it.
    expect(drop).toBeGreaterThan(0)
    expect(drop).toBeLessThan(0.15)
  })

  it('barely moves in an unplanted tank', () => {
    const values = oneDay({}).map((d) => d.ph)
    expect(Math.max(...values) - Math.min(...values)).toBeLessThan(0.2)
  })

  it('drifts slowly but stays near the baseline over weeks', () => {
    const sim = simulate({})
    const weekly = sample(sim, 28 * 24 * HOUR_S, 24 * HOUR_S, () => sim.snapshot().ph)
    for (const ph of weekly) expect(Math.abs(ph - BASELINE_PH.tropical_freshwater)).toBeLessThan(0.3)
    expect(new Set(weekly.map((v) => v.toFixed(4))).size).toBeGreaterThan(1)
  })
})

describe('pH crash', () => {
  it('follows a smooth S-curve down one unit over three hours', () => {
    expect(crashOffset(null)).toBe(0)
    expect(crashOffset(0)).toBe(0)
    expect(crashOffset(CRASH_DURATION_S / 2)).toBeCloseTo(-0.5, 12)
    expect(crashOffset(CRASH_DURATION_S)).toBeCloseTo(-1, 12)
    expect(crashOffset(10 * CRASH_DURATION_S)).toBeCloseTo(-1, 12)
  })

  it('comes back along the same curve when the crash is bounded', () => {
    const lasts = CRASH_DURATION_S / 2
    expect(crashOffset(lasts - 1, lasts)).toBeCloseTo(-0.5, 3)
    expect(crashOffset(lasts + CRASH_DURATION_S / 2, lasts)).toBeCloseTo(-0.25, 12)
    expect(crashOffset(lasts + CRASH_DURATION_S, lasts)).toBe(-0)
    expect(crashOffset(lasts + 5 * CRASH_DURATION_S, lasts)).toBe(-0)
  })

  it('drops the tank about 1 pH below an identical tank without the fault', () => {
    const plan = { scenario: 'ph_crash' as const, startAfterS: 600, repeatEveryS: null }
    const crashing = simulate({}, { plan })
    const normal = simulate({})
    crashing.advance(600)
    normal.advance(600)
    expect(crashing.snapshot().ph).toBeCloseTo(normal.snapshot().ph, 9)
    crashing.advance(4 * HOUR_S)
    normal.advance(4 * HOUR_S)
    expect(crashing.snapshot().ph - normal.snapshot().ph).toBeCloseTo(-1, 6)
  })
})

describe('determinism', () => {
  it('replays the same series from the same seed and a different one from another', () => {
    const series = (seed: number) => {
      const sim = simulate({}, { seed })
      return sample(sim, 12 * HOUR_S, HOUR_S, () => sim.readings('2024-01-15T00:00:00.000Z'))
    }
    expect(series(3)).toEqual(series(3))
    expect(series(3)).not.toEqual(series(4))
  })
})
