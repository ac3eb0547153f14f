import { describe, expect, it } from 'vitest'
import { METRICS, isMetricKey } from '@shared/metrics'
import { compensateTo25C } from '@shared/chemistry/conductivity'
import { conductivityFromSalinity } from '@shared/chemistry/salinity'
import { initialSaltState, salinityOf, stepSalt } from '../../../simulator/model/salinity'
import { HOUR_S, sample, simulate } from './fixtures'

const reef = { kind: 'marine' as const, dimensions: { shape: 'rectangular' as const, lengthCm: 100, widthCm: 50, heightCm: 50 }, volumeLitres: 250 }

describe('salt in a simulated tank', () => {
  it('a marine node reports conductivity at 25 °C and the salinity its probe computes (PSS-78), near 35, over a day', () => {
    const sim = simulate(reef)
    const days = sample(sim, 24 * HOUR_S, HOUR_S, () => sim.readings(new Date(sim.snapshot().simMs).toISOString()))
    for (const readings of days) {
      expect(readings.map((r) => r.metric)).toEqual(['temperature', 'ph', 'light', 'water_level', 'conductivity', 'salinity'])
      const byMetric = Object.fromEntries(readings.map((r) => [r.metric, r]))
      for (const r of readings) {
        if (!isMetricKey(r.metric)) throw new Error(r.metric)
        expect(r.unit).toBe(METRICS[r.metric].unit)
        expect(r.value).toBeLessThanOrEqual(METRICS[r.metric].plausible.max)
      }
      // The pair agrees: PSS-78's conductivity for that salinity at that temperature, referred to 25 °C (noise and rounding aside).
      const t = byMetric.temperature!.value
      const expected = compensateTo25C(conductivityFromSalinity(byMetric.salinity!.value, t), t)
      expect(Math.abs(byMetric.conductivity!.value / expected - 1)).toBeLessThan(0.001)
      expect(Math.abs(byMetric.salinity!.value - 35)).toBeLessThan(0.6)
    }
  })

  it('a freshwater node has no salt probe', () => {
    const sim = simulate({ kind: 'planted' })
    sim.advance(HOUR_S)
    expect(sim.readings('2024-01-15T01:00:00.000Z').map((r) => r.metric)).toEqual(['temperature', 'ph', 'light', 'water_level'])
  })

  it('evaporation concentrates the salt, a water change keeps it at the mix', () => {
    const start = initialSaltState('marine', 200)
    expect(salinityOf(start, 200)).toBe(35)
    // 10 L evaporate: same salt in 190 L.
    const evaporated = stepSalt(start, 'marine', 200, 190, false)
    expect(salinityOf(evaporated, 190)).toBeCloseTo(35 * (200 / 190), 9)
    // Half drained and refilled with new water at 35: (36.84 × 95 + 35 × 95) / 190.
    const drained = stepSalt(evaporated, 'marine', 190, 95, true)
    expect(salinityOf(drained, 95)).toBeCloseTo(35 * (200 / 190), 9)
    const refilled = stepSalt(drained, 'marine', 95, 190, true)
    expect(salinityOf(refilled, 190)).toBeCloseTo((35 * (200 / 190) + 35) / 2, 9)
  })
})
