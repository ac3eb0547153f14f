// Light at the sensor, following the tank's photoperiod in its site's wall-clock time.
import type { TankKind } from '@shared/schemas/tanks'
import { minutesAfter, parseClockTime } from './clock'

/** Lights dim up after "on" and down before "off" over this many minutes (common practice). */
export const RAMP_MINUTES = 15

/**
 * Lux at the sensor with the lights fully on. from memory: a community tank under one LED bar
 * reads a few thousand lux, planted and reef lighting several times more.
 */
export const FULL_SCALE_LUX: Record<TankKind, number> = {
  tropical_freshwater: 4000,
  planted: 15000,
  coldwater: 3000,
  brackish: 5000,
  marine: 30000,
}

export interface LightSchedule {
  on: string
  off: string
}

/** 0 (off) … 1 (full) at a local time; schedules may run past midnight. */
export function scheduleFraction(minutesOfDay: number, schedule: LightSchedule | null): number {
  if (!schedule) return 0
  const on = parseClockTime(schedule.on)
  const photoperiod = minutesAfter(on, parseClockTime(schedule.off))
  if (photoperiod === 0) return 0
  const sinceOn = minutesAfter(on, minutesOfDay)
  if (sinceOn >= photoperiod) return 0
  const ramp = Math.min(RAMP_MINUTES, photoperiod / 2)
  return Math.min(1, sinceOn / ramp, (photoperiod - sinceOn) / ramp)
}

/** Lux from the fixture: full scale when stuck on, the schedule's fraction otherwise. */
export function lightLux(kind: TankKind, fraction: number, stuckOn: boolean): number {
  return FULL_SCALE_LUX[kind] * (stuckOn ? 1 : fraction)
}
