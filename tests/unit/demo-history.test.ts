// The demo seed's pure parts: a tank's month of readings, the month's story, and the rule replay.
import { describe, expect, it } from 'vitest'
import { lastEndedPeriod } from '@shared/report/period'
import { localDateAt, localToInstant } from '@shared/time/zoned'
import { DRAIN_MS, localClock, REFILL_MS, tankHistory, type Episode } from '../../server/demo/demo-history/readings'
import { replayTrips } from '../../server/demo/demo-history/rule-replay'
import { demoStory, HISTORY_DAYS, PLANNED_LATE } from '../../server/demo/demo-history/story'
import { DEMO_TANKS } from '../../server/demo/demo-scenario'
import { FULL_SCALE_LUX } from '../../simulator/model/light'

const ZONE = 'Europe/Berlin'
const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS
/** Wednesday 2 December 2026, 14:20 in Berlin. */
const NOW = Date.UTC(2026, 11, 2, 13, 20)
const FROM = localToInstant(ZONE, { year: 2026, month: 11, day: 2 }, 0)

type Spec = Parameters<typeof tankHistory>[0]
const community: Spec = {
  name: 'Community',
  kind: 'tropical_freshwater',
  dimensions: { shape: 'rectangular', lengthCm: 60, widthCm: 40, heightCm: 40 },
  volumeLitres: 96,
  heater: { watts: 100, setPointC: 25.5, topCm: 22 },
  lightSchedule: { on: '09:00', off: '19:00' },
  timeZone: ZONE,
  substrateDepthCm: 5,
}
const planted: Spec = { ...community, name: 'Planted', kind: 'planted', lightSchedule: { on: '10:00', off: '18:00' } }
const week = (spec: Spec, episodes: Episode[] = [], seed = 1) =>
  tankHistory(spec, { fromMs: NOW - 7 * DAY_MS, toMs: NOW, reportEveryMs: 5 * 60_000, seed, episodes })

const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length

describe('a demo tank’s month of readings', () => {
  it('is the same for the same seed and differs for another', () => {
    expect(week(community)).toEqual(week(community))
    expect(week(community, [], 2).values.temperature).not.toEqual(week(community).values.temperature)
  })

  it('reports every five minutes, each metric at every time', () => {
    const h = week(community)
    expect(h.times).toHaveLength((7 * DAY_MS) / (5 * 60_000))
    for (const values of Object.values(h.values)) expect(values).toHaveLength(h.times.length)
  })

  it('keeps a heated tank within its thermostat’s band around the set point', () => {
    const { values } = week(community)
    // Thermostat ±0.3 K (the simulator's assumption) plus 0.02 K sensor noise and a little overshoot.
    expect(Math.min(...values.temperature)).toBeGreaterThan(25.5 - 0.45)
    expect(Math.max(...values.temperature)).toBeLessThan(25.5 + 0.45)
  })

  it('lights the tank only in its photoperiod, on the site’s clock', () => {
    const h = week(community)
    const minutes = localClock(ZONE)
    h.times.forEach((at, i) => {
      const m = minutes(at)
      const lux = h.values.light[i]!
      if (m < 9 * 60 || m >= 19 * 60) expect(lux).toBe(0)
      else if (m >= 9 * 60 + 15 && m < 18 * 60 + 45) expect(lux).toBeGreaterThan(FULL_SCALE_LUX.tropical_freshwater * 0.95)
    })
  })

  it('raises a planted tank’s pH in the photoperiod and lets it fall back at night', () => {
    const h = week(planted)
    const lit = h.values.ph.filter((_, i) => h.values.light[i]! > 0)
    const dark = h.values.ph.filter((_, i) => h.values.light[i] === 0)
    // common practice: about ±0.2 pH between day and night in a planted tank.
    expect(mean(lit) - mean(dark)).toBeGreaterThan(0.15)
    expect(mean(lit) - mean(dark)).toBeLessThan(0.45)
  })

  it('plays a water change, a stuck heater and a quiet node in', () => {
    const start = NOW - 3 * DAY_MS
    const h = week(community, [
      { kind: 'water_change', fromMs: start, percent: 12 },
      { kind: 'heater_stuck_on', fromMs: start + 12 * HOUR_MS, toMs: start + 20 * HOUR_MS },
      { kind: 'sensor_quiet', fromMs: start + 30 * HOUR_MS, toMs: start + 31 * HOUR_MS },
    ])
    const at = (ms: number) => h.times.findIndex((t) => t >= ms)
    const before = h.values.water_level[at(start) - 1]!
    const low = Math.min(...h.values.water_level.slice(at(start), at(start + DRAIN_MS + REFILL_MS)))
    // 12 % of the water above the substrate comes out, and goes back in; a node reporting every
    // five minutes catches most of the dip, not necessarily its bottom.
    expect(before - low).toBeGreaterThan((before - 5) * 0.12 * 0.7)
    expect(before - low).toBeLessThan((before - 5) * 0.12 + 0.2)
    expect(h.values.water_level[at(start + DRAIN_MS + REFILL_MS + HOUR_MS)]).toBeCloseTo(before, 0)
    expect(h.values.temperature[at(start + 20 * HOUR_MS)]).toBeGreaterThan(27)
    expect(h.times.filter((t) => t >= start + 30 * HOUR_MS && t < start + 31 * HOUR_MS)).toEqual([])
  })
})

describe('the month’s story', () => {
  const tanks = DEMO_TANKS.map((t) => ({ name: t.name, kind: t.kind, stage: t.stage, timeZone: ZONE }))
  const story = demoStory(tanks, NOW)

  it('starts at local midnight thirty days back and ends now', () => {
    expect(story.fromMs).toBe(FROM)
    expect(story.toMs).toBe(NOW)
    expect(NOW - story.fromMs).toBeGreaterThan(HISTORY_DAYS * DAY_MS)
  })

  it('does the care on schedule, late only where planned, and nothing in the future', () => {
    expect(story.care.filter((c) => c.daysLate > 0).map(({ tank, kind, daysLate }) => ({ tank, kind, daysLate }))).toEqual(
      expect.arrayContaining(PLANNED_LATE.map(({ tank, kind, daysLate }) => ({ tank, kind, daysLate }))),
    )
    expect(story.care.filter((c) => c.daysLate > 0)).toHaveLength(PLANNED_LATE.length)
    for (const c of story.care) expect(c.at).toBeLessThan(NOW)
    expect(story.care.some((c) => c.tank === 'Spare tub S1')).toBe(false)
    // Weekly water changes on each of the nine live tanks.
    expect(story.care.filter((c) => c.kind === 'water_change').length).toBeGreaterThanOrEqual(9 * 4)
    expect(story.testKits.length).toBe(story.care.filter((c) => c.kind === 'test_kit_check').length)
  })

  it('puts two faults in last week, one the week before and one in the last seven days', () => {
    const lastWeek = lastEndedPeriod('week', NOW, ZONE)
    const faults = [...story.episodes.values()].flat().filter((e) => e.kind !== 'water_change')
    expect(faults.filter((e) => e.fromMs >= lastWeek.from && e.fromMs < lastWeek.to)).toHaveLength(2)
    expect(faults.filter((e) => e.fromMs < lastWeek.from)).toHaveLength(1)
    expect(faults.filter((e) => e.fromMs >= NOW - 7 * DAY_MS).length).toBeGreaterThanOrEqual(1)
  })

  it('brings one arrival into quarantine, a few days ago', () => {
    expect(story.arrival.tank).toBe('Quarantine Q1')
    expect(localDateAt(ZONE, story.arrival.at)).toEqual(localDateAt(ZONE, NOW - 2 * DAY_MS))
    expect(new Set(story.photos.map((p) => p.tank)).size).toBeGreaterThanOrEqual(4)
  })
})

describe('replaying a rule over the history', () => {
  it('trips after the hold, follows the peak, and clears past the margin', () => {
    const times = Array.from({ length: 12 }, (_, i) => i * 5 * 60_000)
    const values = [26, 26, 28.5, 28.8, 29.2, 29, 28.2, 27.8, 27.4, 27, 26.5, 26]
    const trips = replayTrips(
      { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
      { times, values },
      { fromMs: 0, toMs: 60 * 60_000, tickMs: 60_000 },
    )
    expect(trips).toHaveLength(1)
    expect(trips[0]).toMatchObject({ since: 10 * 60_000, at: 20 * 60_000, value: 29.2, peak: 29.2, clearedAt: 40 * 60_000, clearValue: 27.4 })
  })

  it('trips a quiet rule on the timer during a silence', () => {
    const times = [0, 5, 10, 40, 45].map((m) => m * 60_000)
    const trips = replayTrips(
      { kind: 'quiet', metric: 'temperature', quietMinutes: 15 },
      { times, values: times.map(() => 26) },
      { fromMs: 0, toMs: 50 * 60_000, tickMs: 60_000 },
    )
    expect(trips).toHaveLength(1)
    expect(trips[0]).toMatchObject({ since: 10 * 60_000, at: 25 * 60_000, clearedAt: 40 * 60_000 })
  })
})
