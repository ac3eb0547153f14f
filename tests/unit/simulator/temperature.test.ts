import { describe, expect, it } from 'vitest'
import { hoursToHeat } from '@shared/chemistry/heater'
import { litresAtLevel, START_FILL_FRACTION } from '../../../simulator/model/geometry'
import {
  heatCapacityJPerK,
  lossConductanceWPerK,
  mixedTemperatureC,
  roomTemperatureC,
  stepTemperature,
  thermostatOn,
} from '../../../simulator/model/temperature'
import { HOUR_S, sample, simulate } from './fixtures'

const constantRoom = (c: number) => () => c

describe('thermostat', () => {
  it('switches with ±0.3 K hysteresis around the set point', () => {
    expect(thermostatOn(25.69, 26, false)).toBe(true)
    expect(thermostatOn(25.8, 26, false)).toBe(false)
    expect(thermostatOn(25.8, 26, true)).toBe(true)
    expect(thermostatOn(26.29, 26, true)).toBe(true)
    expect(thermostatOn(26.31, 26, true)).toBe(false)
  })
})

describe('room temperature', () => {
  it('swings 21 ± 2 °C, warmest mid-afternoon', () => {
    expect(roomTemperatureC(15 * 60)).toBeCloseTo(23, 9)
    expect(roomTemperatureC(3 * 60)).toBeCloseTo(19, 9)
    expect(roomTemperatureC(9 * 60)).toBeCloseTo(21, 9)
  })
})

describe('tank temperature', () => {
  it('holds within ±0.6 K of the set point with a working heater (100 W, 60 L, 26 °C)', () => {
    const sim = simulate({})
    sim.advance(12 * HOUR_S)
    const temps = sample(sim, 12 * HOUR_S, 300, () => sim.snapshot().waterC)
    for (const t of temps) expect(Math.abs(t - 26)).toBeLessThanOrEqual(0.6)
    // The thermostat really cycles rather than sitting still.
    expect(Math.max(...temps) - Math.min(...temps)).toBeGreaterThan(0.3)
  })

  it('climbs past 28 °C with the heater stuck on (100 W in 60 L, set point 26 °C)', () => {
    const sim = simulate({}, { plan: { scenario: 'heater_stuck_on', startAfterS: 0, repeatEveryS: null } })
    sim.advance(6 * HOUR_S)
    expect(sim.snapshot().waterC).toBeGreaterThan(28)
    expect(sim.snapshot().heaterOn).toBe(true)
  })

  it('settles at T_room + P/(U·A) with the heater stuck on and a constant room', () => {
    const inputs = {
      waterLitres: 60,
      exposedAreaM2: 0.82,
      roomC: 21,
      heater: { watts: 100, setPointC: 26 },
      heaterMode: 'stuck_on' as const,
      heaterSubmerged: true,
    }
    let state = { waterC: 26, heaterOn: true }
    for (let t = 0; t < 10 * 24 * HOUR_S; t += 30) state = stepTemperature(state, inputs, 30)
    const expected = 21 + 100 / lossConductanceWPerK(0.82)
    expect(state.waterC).toBeCloseTo(expected, 3)
    expect(expected).toBeGreaterThan(28)
  })

  it('falls toward room temperature with the heater failed', () => {
    const sim = simulate({}, { plan: { scenario: 'heater_failed', startAfterS: 0, repeatEveryS: null } })
    const temps = sample(sim, 24 * HOUR_S, HOUR_S, () => sim.snapshot().waterC)
    for (let i = 1; i < 6; i++) expect(temps[i]).toBeLessThan(temps[i - 1])
    expect(temps[23]).toBeLessThan(22.5)
    expect(temps[23]).toBeGreaterThan(18.5)
  })

  // Lumped-capacitance cooling, T − T∞ = (T0 − T∞)·exp(−t/τ), τ = m·c/(U·A): Incropera & DeWitt,
  // Fundamentals of Heat and Mass Transfer, lumped capacitance method (from memory).
  it('cools along the lumped-capacitance exponential', () => {
    const sim = simulate({ heater: null }, { initialWaterC: 26, roomC: constantRoom(21) })
    const litres = litresAtLevel(sim.geometry, sim.geometry.heightCm * START_FILL_FRACTION)
    const tauS = heatCapacityJPerK(litres, 23.5) / lossConductanceWPerK(sim.geometry.exposedAreaM2)
    sim.advance(tauS)
    expect(sim.snapshot().waterC).toBeCloseTo(21 + 5 / Math.E, 1)
    sim.advance(tauS)
    expect(sim.snapshot().waterC).toBeCloseTo(21 + 5 / Math.E ** 2, 1)
  })

  it('needs at least the loss-free heat-up time of shared/chemistry/heater, and not much more', () => {
    const sim = simulate({}, { plan: { scenario: 'heater_stuck_on', startAfterS: 0, repeatEveryS: null }, initialWaterC: 24, roomC: constantRoom(24) })
    let seconds = 0
    while (sim.snapshot().waterC < 25) {
      sim.advance(10)
      seconds += 10
    }
    const litres = litresAtLevel(sim.geometry, sim.geometry.heightCm * START_FILL_FRACTION)
    const lowerBoundH = hoursToHeat(litres, 1, 100)
    expect(seconds / 3600).toBeGreaterThanOrEqual(lowerBoundH)
    expect(seconds / 3600).toBeLessThan(lowerBoundH * 1.1)
  })

  it('stays put with no heater when the room equals the water (energy balance)', () => {
    const sim = simulate({ heater: null }, { initialWaterC: 23, roomC: constantRoom(23) })
    sim.advance(48 * HOUR_S)
    expect(sim.snapshot().waterC).toBeCloseTo(23, 9)
  })

  it('gets no heat from a heater above the waterline', () => {
    const inputs = { waterLitres: 60, exposedAreaM2: 0.8, roomC: 21, heater: { watts: 100, setPointC: 26 }, heaterMode: 'stuck_on' as const }
    const dry = stepTemperature({ waterC: 26, heaterOn: true }, { ...inputs, heaterSubmerged: false }, 60)
    const none = stepTemperature({ waterC: 26, heaterOn: false }, { ...inputs, heater: null, heaterSubmerged: true }, 60)
    expect(dry.waterC).toBeCloseTo(none.waterC, 12)
    expect(dry.waterC).toBeLessThan(26)
  })

  it('mixes added water by mass-weighted temperature (calorimetry)', () => {
    expect(mixedTemperatureC(50, 26, 50, 20)).toBeCloseTo(23, 12)
    expect(mixedTemperatureC(75, 26, 25, 22)).toBeCloseTo(25, 12)
  })
})
