import { describe, expect, it } from 'vitest'
import { footprintCm2 } from '@shared/chemistry/volume'
import { DEFAULT_HEIGHT_CM, litresAtLevel, tankGeometry } from '../../../simulator/model/geometry'
import { EVAPORATION_FRACTION_PER_DAY, initialLevelState, stepLevel, TOP_UP_TRIGGER_CM, WATER_CHANGE, waterChangeLevelCm } from '../../../simulator/model/level'
import { HOUR_S, sample, simulate, spec } from './fixtures'

const display2 = {
  kind: 'planted' as const,
  dimensions: { shape: 'rectangular' as const, lengthCm: 90, widthCm: 45, heightCm: 45 },
  volumeLitres: 182,
  heater: { watts: 200, setPointC: 25, topCm: 24 },
}

describe('geometry', () => {
  it('uses the dimensions when known', () => {
    const g = tankGeometry(spec(display2))
    expect(g.heightCm).toBe(45)
    expect(g.footprintCm2).toBe(90 * 45)
    expect(g.exposedAreaM2).toBeCloseTo((2 * (90 + 45) * 45 + 90 * 45) / 10_000, 12)
    expect(litresAtLevel(g, 40)).toBeCloseTo(162, 9)
  })

  it('treats an entered volume as the water at 90 % of a 40 cm tank', () => {
    const g = tankGeometry(spec({ volumeLitres: 60 }))
    expect(g.heightCm).toBe(DEFAULT_HEIGHT_CM)
    expect(litresAtLevel(g, 0.9 * DEFAULT_HEIGHT_CM)).toBeCloseTo(60, 9)
  })

  it('agrees with shared/chemistry for a cylinder', () => {
    const dims = { shape: 'cylinder' as const, diameterCm: 50, heightCm: 60 }
    const g = tankGeometry(spec({ dimensions: dims }))
    expect(g.footprintCm2).toBeCloseTo(footprintCm2(dims), 9)
    expect(g.exposedAreaM2).toBeCloseTo((Math.PI * 50 * 60 + footprintCm2(dims)) / 10_000, 9)
  })
})

describe('evaporation and top-up', () => {
  it('loses about 1.5 % of the water column a day', () => {
    let state = initialLevelState(36)
    for (let t = 0; t < 86_400; t += 30) state = stepLevel(state, 30)
    expect(state.toppingUp).toBe(false)
    expect(Math.abs(state.levelCm - 36 * (1 - EVAPORATION_FRACTION_PER_DAY))).toBeLessThan(0.01)
  })

  it('tops up to the target once the level has fallen 1 cm', () => {
    let state = initialLevelState(36)
    const levels: number[] = []
    for (let t = 0; t < 5 * 86_400; t += 30) {
      state = stepLevel(state, 30)
      levels.push(state.levelCm)
    }
    expect(Math.min(...levels)).toBeGreaterThan(36 - TOP_UP_TRIGGER_CM - 0.01)
    expect(Math.max(...levels)).toBeLessThanOrEqual(36)
    const rises = levels.filter((l, i) => i > 0 && l > levels[i - 1]).length
    expect(rises).toBeGreaterThan(0)
  })
})

describe('large water change', () => {
  it('drains half in 10 minutes, waits, and refills in 15', () => {
    expect(waterChangeLevelCm(0, 40, 40)).toBe(40)
    expect(waterChangeLevelCm(WATER_CHANGE.drainS / 2, 40, 40)).toBeCloseTo(30, 9)
    expect(waterChangeLevelCm(WATER_CHANGE.drainS, 40, 40)).toBeCloseTo(20, 9)
    expect(waterChangeLevelCm(WATER_CHANGE.drainS + WATER_CHANGE.waitS + WATER_CHANGE.refillS / 2, 40, 40)).toBeCloseTo(30, 9)
    expect(waterChangeLevelCm(WATER_CHANGE.drainS + WATER_CHANGE.waitS + WATER_CHANGE.refillS, 40, 40)).toBeNull()
  })

  it('uncovers the heater in Display 2 and comes back to the same level, once an hour', () => {
    const sim = simulate(display2, { plan: { scenario: 'large_water_change', startAfterS: 120, repeatEveryS: 3600 } })
    const start = sim.snapshot().levelCm
    expect(start).toBeCloseTo(40.5, 9)
    sim.advance(120 + 600)
    expect(sim.snapshot().levelCm).toBeCloseTo(20.25, 1)
    expect(sim.snapshot().levelCm).toBeLessThan(display2.heater.topCm)
    sim.advance(35 * 60)
    expect(Math.abs(sim.snapshot().levelCm - start)).toBeLessThan(0.05)
    // The tank stays warm enough through the change: refill water is tempered.
    expect(Math.abs(sim.snapshot().waterC - 25)).toBeLessThan(1)
    const lows = sample(sim, 2 * HOUR_S, 60, () => sim.snapshot().levelCm).filter((l) => l < 21)
    expect(lows.length).toBeGreaterThanOrEqual(2 * 9)
  })
})
