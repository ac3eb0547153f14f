import { describe, expect, it } from 'vitest'
import { localMinutesOfDay, minutesAfter, parseClockTime } from '../../../simulator/model/clock'
import { FULL_SCALE_LUX, lightLux, scheduleFraction } from '../../../simulator/model/light'
import { sample, simulate, WINTER_MIDNIGHT_BERLIN } from './fixtures'

const schedule = { on: '09:00', off: '20:00' }
const minutes = (h: number, m = 0, s = 0) => h * 60 + m + s / 60

describe('site clock', () => {
  it('reads wall-clock minutes in the site zone', () => {
    // 15 Jan 2024 11:00 UTC is 12:00 CET (UTC+1).
    expect(localMinutesOfDay(Date.UTC(2024, 0, 15, 11, 0), 'Europe/Berlin')).toBe(720)
    expect(localMinutesOfDay(Date.UTC(2024, 0, 15, 11, 0), 'UTC')).toBe(660)
    expect(localMinutesOfDay(Date.UTC(2024, 0, 15, 11, 0, 30), 'UTC')).toBe(660.5)
  })

  // Directive 2000/84/EC, art. 2: summer time begins at 01:00 UTC on the last Sunday of March
  // (31 March 2024), when central Europe moves from UTC+1 to UTC+2.
  it('follows the change to summer time', () => {
    expect(localMinutesOfDay(Date.UTC(2024, 2, 30, 8, 0), 'Europe/Berlin')).toBe(540)
    expect(localMinutesOfDay(Date.UTC(2024, 2, 31, 8, 0), 'Europe/Berlin')).toBe(600)
  })

  it('parses HH:MM and measures forward around the dial', () => {
    expect(parseClockTime('09:30')).toBe(570)
    expect(() => parseClockTime('24:00')).toThrow(RangeError)
    expect(minutesAfter(minutes(22), minutes(2))).toBe(240)
    expect(minutesAfter(minutes(2), minutes(22))).toBe(1200)
  })
})

describe('light schedule', () => {
  it('is full between the ramps and dark outside the photoperiod', () => {
    expect(scheduleFraction(minutes(12), schedule)).toBe(1)
    expect(scheduleFraction(minutes(8, 59), schedule)).toBe(0)
    expect(scheduleFraction(minutes(20, 0), schedule)).toBe(0)
    expect(scheduleFraction(minutes(3), schedule)).toBe(0)
  })

  it('ramps over 15 minutes after on and before off', () => {
    expect(scheduleFraction(minutes(9, 7, 30), schedule)).toBeCloseTo(0.5, 9)
    expect(scheduleFraction(minutes(9, 15), schedule)).toBe(1)
    expect(scheduleFraction(minutes(19, 52, 30), schedule)).toBeCloseTo(0.5, 9)
  })

  it('handles a photoperiod that runs past midnight', () => {
    const late = { on: '20:00', off: '02:00' }
    expect(scheduleFraction(minutes(23), late)).toBe(1)
    expect(scheduleFraction(minutes(1, 52, 30), late)).toBeCloseTo(0.5, 9)
    expect(scheduleFraction(minutes(3), late)).toBe(0)
    expect(scheduleFraction(minutes(19), late)).toBe(0)
  })

  it('is dark without a schedule and full when stuck on', () => {
    expect(scheduleFraction(minutes(12), null)).toBe(0)
    expect(lightLux('planted', 0, true)).toBe(FULL_SCALE_LUX.planted)
    expect(lightLux('planted', 0.25, false)).toBe(FULL_SCALE_LUX.planted / 4)
  })
})

describe('simulated light sensor', () => {
  it('follows the schedule in the site zone', () => {
    const berlin = simulate({})
    const utc = simulate({ timeZone: 'UTC' })
    // 08:30 UTC: 09:30 in Berlin (lights on), still 08:30 in UTC (lights off).
    const toEightThirtyUtc = 9.5 * 3600
    berlin.advance(toEightThirtyUtc)
    utc.advance(toEightThirtyUtc)
    expect(berlin.snapshot().lux).toBe(FULL_SCALE_LUX.tropical_freshwater)
    expect(utc.snapshot().lux).toBe(0)
  })

  it('stays on all night when stuck on', () => {
    const sim = simulate({}, { plan: { scenario: 'light_stuck_on', startAfterS: 0, repeatEveryS: null } })
    const lux = sample(sim, 24 * 3600, 1800, () => sim.snapshot().lux)
    expect(Math.min(...lux)).toBe(FULL_SCALE_LUX.tropical_freshwater)
  })

  it('reads dark overnight and full at midday on a normal day', () => {
    const sim = simulate({})
    expect(sim.snapshot().simMs).toBe(WINTER_MIDNIGHT_BERLIN)
    sim.advance(3 * 3600)
    expect(sim.snapshot().lux).toBe(0)
    sim.advance(9 * 3600)
    expect(sim.snapshot().lux).toBe(FULL_SCALE_LUX.tropical_freshwater)
  })

  it('keeps the schedule on the wall clock when the simulation runs faster', () => {
    // At 20× a simulated day passes in 72 real minutes; the light timer still reads the real clock.
    const fast = simulate({}, { speed: 20 })
    fast.advance(12 * 3600 * 20) // twelve real hours: noon in Berlin
    expect(fast.snapshot().lux).toBe(FULL_SCALE_LUX.tropical_freshwater)
    fast.advance(12 * 3600 * 20 - 3 * 3600 * 20) // 21:00 real: lights off
    expect(fast.snapshot().lux).toBe(0)
    // Three real hours after midnight is still night, however many simulated days have passed.
    const night = simulate({}, { speed: 20 })
    night.advance(3 * 3600 * 20)
    expect(night.snapshot().lux).toBe(0)
  })
})
