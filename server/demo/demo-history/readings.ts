// A demo tank's past sensor readings, from the simulator's physics: pure and seeded, no I/O.
import { offsetAt } from '@shared/time/zoned'
import { litresAtLevel, START_FILL_FRACTION, tankGeometry } from '../../../simulator/model/geometry'
import { initialLevelState, stepLevel } from '../../../simulator/model/level'
import { lightLux, scheduleFraction } from '../../../simulator/model/light'
import { initialPhState, phValue, stepPh } from '../../../simulator/model/ph'
import { gaussian, mulberry32 } from '../../../simulator/model/random'
import type { SimTankSpec } from '../../../simulator/model/spec'
import { SENSOR_NOISE, REFILL_BELOW_SET_POINT_K } from '../../../simulator/model/tank'
import { mixedTemperatureC, roomTemperatureC, stepTemperature, type HeaterMode } from '../../../simulator/model/temperature'

export const HISTORY_METRICS = ['temperature', 'ph', 'light', 'water_level'] as const
export type HistoryMetric = (typeof HISTORY_METRICS)[number]

/** Something that happened to one tank over [fromMs, toMs). */
export type Episode =
  | { kind: 'heater_stuck_on' | 'heater_failed' | 'sensor_quiet'; fromMs: number; toMs: number }
  /** A partial water change: drained over DRAIN_MS from `fromMs`, refilled with tempered water over REFILL_MS. */
  | { kind: 'water_change'; fromMs: number; percent: number }

export const DRAIN_MS = 8 * 60_000
export const REFILL_MS = 12 * 60_000

/** One column per metric, all of the same length as `times` (epoch ms). */
export interface TankHistory {
  times: number[]
  values: Record<HistoryMetric, number[]>
}

export interface HistoryOptions {
  fromMs: number
  toMs: number
  /** Milliseconds between a node's reports. */
  reportEveryMs: number
  seed: number
  episodes: readonly Episode[]
}

/** Physics step: far below the hours-long thermal time constant and the minutes of a water change. */
const STEP_MS = 150_000
const HOUR_MS = 3_600_000

/** Minutes since local midnight, with the zone's offset looked up once per UTC hour. */
export function localClock(timeZone: string): (epochMs: number) => number {
  const offsets = new Map<number, number>()
  return (epochMs) => {
    const hour = Math.floor(epochMs / HOUR_MS)
    let offset = offsets.get(hour)
    if (offset === undefined) offsets.set(hour, (offset = offsetAt(timeZone, hour * HOUR_MS)))
    const local = epochMs + offset
    return (((local % 86_400_000) + 86_400_000) % 86_400_000) / 60_000
  }
}

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places

function heaterModeAt(episodes: readonly Episode[], at: number): HeaterMode {
  for (const e of episodes) {
    if (e.kind === 'water_change' || at < e.fromMs || at >= e.toMs) continue
    if (e.kind === 'heater_stuck_on') return 'stuck_on'
    if (e.kind === 'heater_failed') return 'failed'
  }
  return 'normal'
}

const isQuiet = (episodes: readonly Episode[], at: number) => episodes.some((e) => e.kind === 'sensor_quiet' && at >= e.fromMs && at < e.toMs)

/** The level a water change holds the tank at, or null outside it. */
function waterChangeLevel(episodes: readonly Episode[], at: number, fullCm: number, floorCm: number): number | null {
  for (const e of episodes) {
    if (e.kind !== 'water_change') continue
    const into = at - e.fromMs
    if (into < 0 || into >= DRAIN_MS + REFILL_MS) continue
    const lowCm = fullCm - ((fullCm - floorCm) * e.percent) / 100
    if (into < DRAIN_MS) return fullCm - (fullCm - lowCm) * (into / DRAIN_MS)
    return lowCm + (fullCm - lowCm) * ((into - DRAIN_MS) / REFILL_MS)
  }
  return null
}

/**
 * The readings a tank's node would have sent over [fromMs, toMs): the heater's thermostat cycling
 * against the room's day–night curve, the lights on their schedule, pH following the light, level
 * falling by evaporation and topped up, and the episodes played in. Nothing is sent while quiet.
 */
export function tankHistory(spec: SimTankSpec & { substrateDepthCm: number }, options: HistoryOptions): TankHistory {
  const random = mulberry32(options.seed)
  const geometry = tankGeometry(spec)
  const minutesOfDay = localClock(spec.timeZone)
  const heater = spec.heater
  let level = initialLevelState(geometry.heightCm * START_FILL_FRACTION)
  let thermal = { waterC: heater?.setPointC ?? roomTemperatureC(minutesOfDay(options.fromMs)), heaterOn: false }
  let wasChanging = false
  const history: TankHistory = { times: [], values: { temperature: [], ph: [], light: [], water_level: [] } }
  const reportEvery = Math.max(1, Math.round(options.reportEveryMs / STEP_MS))
  // The room and the lights depend only on the local minute: one table each for the whole month.
  const roomByMinute = Array.from({ length: 1440 }, (_, m) => roomTemperatureC(m))
  const lightByMinute = Array.from({ length: 1440 }, (_, m) => scheduleFraction(m, spec.lightSchedule))
  let ph = initialPhState(spec.kind, lightByMinute[minutesOfDay(options.fromMs)]!)

  for (let at = options.fromMs, step = 0; at < options.toMs; at += STEP_MS, step++) {
    const minute = Math.floor(minutesOfDay(at)) % 1440
    const roomC = roomByMinute[minute]!
    const light = lightByMinute[minute]!
    if (step % reportEvery === 0 && !isQuiet(options.episodes, at)) {
      const noise = () => gaussian(random)
      history.times.push(at)
      history.values.temperature.push(round(thermal.waterC + SENSOR_NOISE.temperatureC * noise(), 2))
      history.values.ph.push(round(phValue(spec.kind, ph, null) + SENSOR_NOISE.ph * noise(), 2))
      history.values.light.push(Math.max(0, Math.round(lightLux(spec.kind, light, false) * (1 + SENSOR_NOISE.luxFraction * noise()))))
      history.values.water_level.push(round(Math.max(0, level.levelCm + SENSOR_NOISE.levelCm * noise()), 2))
    }

    const before = level.levelCm
    const changing = waterChangeLevel(options.episodes, at + STEP_MS, level.targetCm, spec.substrateDepthCm)
    const inChange = changing !== null || wasChanging
    if (changing !== null) level = { ...level, levelCm: changing, toppingUp: false }
    // The refill ends at the usual level, whatever step it ends in.
    else level = wasChanging ? { ...level, levelCm: level.targetCm } : stepLevel(level, STEP_MS / 1000)
    wasChanging = changing !== null
    const added = litresAtLevel(geometry, level.levelCm) - litresAtLevel(geometry, before)
    if (added > 0) {
      // Water-change water is tempered to the tank; top-up water comes at room temperature.
      const addedC = inChange && heater ? heater.setPointC - REFILL_BELOW_SET_POINT_K : roomC
      thermal = { ...thermal, waterC: mixedTemperatureC(litresAtLevel(geometry, before), thermal.waterC, added, addedC) }
    }
    thermal = stepTemperature(
      thermal,
      {
        waterLitres: litresAtLevel(geometry, level.levelCm),
        exposedAreaM2: geometry.exposedAreaM2,
        roomC,
        heater,
        heaterMode: heaterModeAt(options.episodes, at),
        heaterSubmerged: !heater || level.levelCm >= heater.topCm,
      },
      STEP_MS / 1000,
    )
    ph = stepPh(ph, spec.kind, light, STEP_MS / 1000, random)
  }
  return history
}
