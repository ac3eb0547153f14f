import type { TankState } from '@shared/schemas/tank-status'
import { formatTimeOfDay } from '@shared/time'

export interface StateLook {
  word: string
  icon: string
  /** Theme colour name (see plugins/vuetify). */
  color: TankState
  hint: string
}

// Colour never carries the meaning alone: each state has its own icon shape and word.
export const STATE_LOOKS: Record<TankState, StateLook> = {
  steady: { word: 'Steady', icon: 'mdi-check-circle', color: 'steady', hint: 'All readings in band' },
  watch: { word: 'Watch', icon: 'mdi-eye', color: 'watch', hint: 'Near a limit, or a warning is open' },
  alarm: { word: 'Alarm', icon: 'mdi-alert-octagon', color: 'alarm', hint: 'An alarm is open' },
  quiet: { word: 'Quiet', icon: 'mdi-access-point-network-off', color: 'quiet', hint: 'No fresh data from a device' },
  // Neutral, not green: nothing is known about the water, which is not the same as "all in band".
  no_sensor: { word: 'No sensor', icon: 'mdi-help-circle-outline', color: 'no_sensor', hint: 'No device and no reading: nothing tells how this tank is' },
}

export interface HeaterLine {
  text: string
  /** How urgent the line reads: the heater top out of water is an alarm on its own. */
  tone: 'steady' | 'watch' | 'alarm'
  marginCm: number
}

/** Centimetres of water over the heater top under which a tile asks for a look (our own margin, not a published figure). */
export const HEATER_MARGIN_WATCH_CM = 3

/** "8.5 cm above heater" from the water level and the heater top, both in cm above the tank floor. */
export function heaterLine(levelCm: number | null | undefined, heaterTopCm: number | null | undefined): HeaterLine | null {
  if (levelCm == null || heaterTopCm == null || !Number.isFinite(levelCm) || !Number.isFinite(heaterTopCm)) return null
  const margin = Math.round((levelCm - heaterTopCm) * 10) / 10
  if (margin < 0) return { text: `${Math.abs(margin).toFixed(1)} cm below heater top`, tone: 'alarm', marginCm: margin }
  if (margin === 0) return { text: 'level with heater top', tone: 'alarm', marginCm: margin }
  return { text: `${margin.toFixed(1)} cm above heater`, tone: margin < HEATER_MARGIN_WATCH_CM ? 'watch' : 'steady', marginCm: margin }
}

export interface LightLine {
  word: string
  icon: string
  detail: string
  offSchedule: boolean
}

export function lightLine(lightOn: boolean | null, scheduledOn: boolean | null, schedule: { on: string; off: string } | null): LightLine | null {
  if (lightOn == null) return null
  const word = lightOn ? 'Light on' : 'Light off'
  const icon = lightOn ? 'mdi-lightbulb-on' : 'mdi-lightbulb-off-outline'
  if (scheduledOn == null || !schedule) return { word, icon, detail: 'no schedule', offSchedule: false }
  const hours = `${formatTimeOfDay(schedule.on)}–${formatTimeOfDay(schedule.off)}`
  if (scheduledOn === lightOn) return { word, icon, detail: `as scheduled ${hours}`, offSchedule: false }
  return { word, icon, detail: `should be ${scheduledOn ? 'on' : 'off'} (${hours})`, offSchedule: true }
}

/**
 * A trend line in words for assistive technology: what it shows, over which span, and its lowest
 * and highest values, since the line's shape cannot be read out.
 */
export function describeTrend(subject: string, points: Array<[number, number]>, format: (value: number) => string): string {
  if (!points.length) return `${subject}: no readings`
  const values = points.map(([, value]) => value)
  const low = Math.min(...values)
  const high = Math.max(...values)
  return low === high ? `${subject}: every reading ${format(low)}` : `${subject}: lowest ${format(low)}, highest ${format(high)}`
}
