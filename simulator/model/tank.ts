// One simulated tank: couples the level, heat, light and pH models on a simulated clock.
import type { DeviceReading } from '@shared/ingest/contract'
import { localMinutesOfDay } from './clock'
import { litresAtLevel, START_FILL_FRACTION, tankGeometry, type TankGeometry } from './geometry'
import { initialLevelState, stepLevel, WATER_CHANGE_TOTAL_S, waterChangeLevelCm, type LevelState } from './level'
import { lightLux, scheduleFraction } from './light'
import { CRASH_DURATION_S, initialPhState, phValue, stepPh, type PhState } from './ph'
import { gaussian, mulberry32, type Random } from './random'
import { hasSaltProbe, initialSaltState, probeReadings, salinityOf, stepSalt, type SaltState } from './salinity'
import { NO_SCENARIO, scenarioElapsedS, type Scenario, type ScenarioPlan } from './scenarios'
import type { SimTankSpec } from './spec'
import { mixedTemperatureC, roomTemperatureC, stepTemperature, type HeaterMode, type ThermalState } from './temperature'

/** Longest physics step; far below the hours-long thermal time constant and the 10-minute drain. */
export const MAX_STEP_S = 30
/** Keepers temper replacement water to within about a kelvin of the tank (common practice). */
export const REFILL_BELOW_SET_POINT_K = 0.5
/** Sensor noise (one standard deviation). Assumptions. */
export const SENSOR_NOISE = { temperatureC: 0.02, ph: 0.01, luxFraction: 0.01, levelCm: 0.05 } as const

export interface TankSimulationOptions {
  seed: number
  /** Simulated clock at the start, epoch ms. */
  startMs: number
  plan?: ScenarioPlan
  /** Room temperature at an instant; the day–night curve in the site's zone by default. */
  roomC?: (epochMs: number) => number
  initialWaterC?: number
  /**
   * How many times faster than real time the simulation runs. The light timer reads the wall
   * clock, as a real one does: lights (and the pH swing that follows them) keep the tank's own
   * schedule at any speed, while heat, level and faults run on simulated time.
   */
  speed?: number
}

export interface TankSnapshot {
  simMs: number
  waterC: number
  roomC: number
  heaterOn: boolean
  ph: number
  lux: number
  levelCm: number
  /** Practical salinity; 0 in a freshwater tank. */
  salinity: number
  /** The tank's scenario is running now. */
  faultActive: boolean
}

const round = (value: number, places: number) => Math.round(value * 10 ** places) / 10 ** places

export class TankSimulation {
  readonly geometry: TankGeometry
  readonly plan: ScenarioPlan
  private readonly random: Random
  private readonly roomAt: (epochMs: number) => number
  private readonly startMs: number
  private readonly speed: number
  private simMs: number
  private thermal: ThermalState
  private ph: PhState
  private level: LevelState
  private changeStartCm: number | null = null
  private salt: SaltState
  /** The probe's own noise, so adding it leaves every other sensor's random stream as it was. */
  private readonly probeRandom: Random

  constructor(
    readonly spec: SimTankSpec,
    options: TankSimulationOptions,
  ) {
    this.geometry = tankGeometry(spec)
    this.plan = options.plan ?? NO_SCENARIO
    this.random = mulberry32(options.seed)
    this.roomAt = options.roomC ?? ((ms) => roomTemperatureC(localMinutesOfDay(ms, spec.timeZone)))
    this.startMs = options.startMs
    this.speed = options.speed ?? 1
    this.simMs = options.startMs
    const waterC = options.initialWaterC ?? spec.heater?.setPointC ?? this.roomAt(options.startMs)
    this.thermal = { waterC, heaterOn: false }
    this.level = initialLevelState(this.geometry.heightCm * START_FILL_FRACTION)
    this.salt = initialSaltState(spec.kind, litresAtLevel(this.geometry, this.level.levelCm))
    this.probeRandom = mulberry32(options.seed ^ 0x5a17)
    this.ph = initialPhState(spec.kind, this.lightFraction())
  }

  get elapsedS(): number {
    return (this.simMs - this.startMs) / 1000
  }

  /** The wall clock at the current simulated instant. */
  private get wallClockMs(): number {
    return this.startMs + (this.simMs - this.startMs) / this.speed
  }

  private faultElapsedS(scenario: Scenario, activeForS = this.plan.activeForS ?? Infinity, atElapsedS = this.elapsedS): number | null {
    return this.plan.scenario === scenario ? scenarioElapsedS(this.plan, atElapsedS, activeForS) : null
  }

  /** Advances the simulated clock by `dtS` seconds. */
  advance(dtS: number): void {
    let remaining = dtS
    while (remaining > 1e-9) {
      const step = Math.min(MAX_STEP_S, remaining)
      this.step(step)
      remaining -= step
    }
  }

  private heaterMode(): HeaterMode {
    if (this.faultElapsedS('heater_stuck_on') !== null) return 'stuck_on'
    if (this.faultElapsedS('heater_failed') !== null) return 'failed'
    return 'normal'
  }

  private lightFraction(): number {
    if (this.faultElapsedS('light_stuck_on') !== null) return 1
    return scheduleFraction(localMinutesOfDay(this.wallClockMs, this.spec.timeZone), this.spec.lightSchedule)
  }

  private stepWater(dtS: number, roomC: number): void {
    const before = this.level.levelCm
    // The level is where the pumps have taken it by the end of this step.
    const change = this.faultElapsedS('large_water_change', WATER_CHANGE_TOTAL_S, this.elapsedS + dtS)
    if (change !== null) {
      this.changeStartCm ??= before
      const levelCm = waterChangeLevelCm(change, this.changeStartCm, this.level.targetCm) ?? this.level.targetCm
      this.level = { ...this.level, levelCm, toppingUp: false }
    } else {
      if (this.changeStartCm !== null) this.level = { ...this.level, levelCm: this.level.targetCm }
      this.changeStartCm = null
      this.level = stepLevel(this.level, dtS)
    }
    const beforeLitres = litresAtLevel(this.geometry, before)
    const afterLitres = litresAtLevel(this.geometry, this.level.levelCm)
    if (hasSaltProbe(this.spec.kind)) this.salt = stepSalt(this.salt, this.spec.kind, beforeLitres, afterLitres, change !== null)
    const addedLitres = afterLitres - beforeLitres
    if (addedLitres > 0) {
      // Water-change water is tempered to the tank; top-up water comes from a reservoir at room temperature.
      const setPoint = this.spec.heater?.setPointC
      const addedC = change !== null && setPoint !== undefined ? setPoint - REFILL_BELOW_SET_POINT_K : roomC
      this.thermal = { ...this.thermal, waterC: mixedTemperatureC(beforeLitres, this.thermal.waterC, addedLitres, addedC) }
    }
  }

  private step(dtS: number): void {
    const roomC = this.roomAt(this.simMs)
    this.stepWater(dtS, roomC)
    const heater = this.spec.heater
    this.thermal = stepTemperature(
      this.thermal,
      {
        waterLitres: litresAtLevel(this.geometry, this.level.levelCm),
        exposedAreaM2: this.geometry.exposedAreaM2,
        roomC,
        heater,
        heaterMode: this.heaterMode(),
        heaterSubmerged: !heater || this.level.levelCm >= heater.topCm,
      },
      dtS,
    )
    this.ph = stepPh(this.ph, this.spec.kind, this.lightFraction(), dtS, this.random, dtS / this.speed)
    this.simMs += dtS * 1000
  }

  /** A bounded crash keeps counting through its recovery. */
  private phNow(): number {
    const lasts = this.plan.activeForS ?? Infinity
    return phValue(this.spec.kind, this.ph, this.faultElapsedS('ph_crash', lasts + CRASH_DURATION_S), lasts)
  }

  /** True values now, without sensor noise. */
  snapshot(): TankSnapshot {
    const fraction = this.lightFraction()
    return {
      simMs: this.simMs,
      waterC: this.thermal.waterC,
      roomC: this.roomAt(this.simMs),
      heaterOn: this.thermal.heaterOn,
      ph: this.phNow(),
      lux: lightLux(this.spec.kind, fraction, false),
      levelCm: this.level.levelCm,
      salinity: salinityOf(this.salt, litresAtLevel(this.geometry, this.level.levelCm)),
      faultActive: this.plan.scenario !== 'none' && scenarioElapsedS(this.plan, this.elapsedS) !== null,
    }
  }

  /** The node has gone silent (sensor_quiet scenario). */
  isQuiet(): boolean {
    return this.faultElapsedS('sensor_quiet') !== null
  }

  /** What the node reports now, with sensor noise, stamped `time` (ISO 8601 with zone). */
  readings(time: string): DeviceReading[] {
    const s = this.snapshot()
    const noise = () => gaussian(this.random)
    const temperatureC = round(s.waterC + SENSOR_NOISE.temperatureC * noise(), 2)
    const readings: DeviceReading[] = [
      { metric: 'temperature', value: temperatureC, unit: 'C', time },
      { metric: 'ph', value: round(s.ph + SENSOR_NOISE.ph * noise(), 2), unit: 'pH', time },
      { metric: 'light', value: Math.max(0, Math.round(s.lux * (1 + SENSOR_NOISE.luxFraction * noise()))), unit: 'lux', time },
      { metric: 'water_level', value: round(Math.max(0, s.levelCm + SENSOR_NOISE.levelCm * noise()), 2), unit: 'cm', time },
    ]
    // A salt tank's node carries a conductivity probe that also reports the practical salinity it computes.
    if (hasSaltProbe(this.spec.kind)) {
      const probe = probeReadings(s.salinity, Math.min(40, Math.max(0, temperatureC)), gaussian(this.probeRandom))
      readings.push({ metric: 'conductivity', value: Math.round(probe.conductivityUsCm), unit: 'uS/cm', time })
      readings.push({ metric: 'salinity', value: round(probe.salinity, 2), unit: 'PSU', time })
    }
    return readings
  }
}
