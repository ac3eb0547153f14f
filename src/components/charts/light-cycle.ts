import { addDays, formatLocalDate, localDateAt, localToInstant, minutesOfClock, type LocalDate } from '@shared/time/zoned'

/** A light reading at or above this many lux counts as lights on (the product's threshold). */
export const LIGHT_ON_LUX = 50

const MINUTE_MS = 60_000
const HOUR_MS = 60 * MINUTE_MS

export interface LightSample {
  t: string
  /** lux */
  value: number
}

export interface Period {
  startMs: number
  endMs: number
}

export interface LightDay {
  /** Local calendar date in the site's zone, `YYYY-MM-DD`. */
  date: string
  dayStartMs: number
  dayEndMs: number
  measured: Period[]
  scheduled: Period[]
  measuredHours: number
  scheduledHours: number | null
  /** Hours of the day the readings cover; a day with little data cannot be judged. */
  coveredHours: number
}

export interface LightCycleOptions {
  timeZone: string
  schedule: { on: string; off: string } | null
  /** A reading stands for this long at most; beyond, the time is unknown rather than on or off. */
  holdMs?: number
  /** Last instant the readings could cover (now, or the end of the range). */
  untilMs?: number
}

/** The photoperiod as set: hours between on and off, across midnight when off comes first. */
export function scheduledHours(schedule: { on: string; off: string }): number {
  const minutes = (minutesOfClock(schedule.off) - minutesOfClock(schedule.on) + 1440) % 1440
  return minutes / 60
}

function medianStepMs(times: number[]): number {
  const steps = times
    .slice(1)
    .map((t, i) => t - times[i]!)
    .filter((s) => s > 0)
    .sort((a, b) => a - b)
  return steps.length ? steps[Math.floor(steps.length / 2)]! : 5 * MINUTE_MS
}

/**
 * Turns readings into on and off spans: each reading holds until the next one, but for no longer
 * than `holdMs`, so an outage is neither on nor off.
 */
function spans(samples: LightSample[], holdMs: number, untilMs: number): Array<Period & { on: boolean }> {
  const points = samples
    .map((s) => ({ ms: Date.parse(s.t), on: s.value >= LIGHT_ON_LUX }))
    .filter((p) => Number.isFinite(p.ms))
    .sort((a, b) => a.ms - b.ms)
  const out: Array<Period & { on: boolean }> = []
  for (let i = 0; i < points.length; i++) {
    const point = points[i]!
    const next = points[i + 1]
    const endMs = Math.min(next ? next.ms : untilMs, point.ms + holdMs)
    if (endMs <= point.ms) continue
    const last = out[out.length - 1]
    if (last && last.on === point.on && last.endMs === point.ms) last.endMs = endMs
    else out.push({ startMs: point.ms, endMs, on: point.on })
  }
  return out
}

function clip(periods: Period[], startMs: number, endMs: number): Period[] {
  return periods.map((p) => ({ startMs: Math.max(p.startMs, startMs), endMs: Math.min(p.endMs, endMs) })).filter((p) => p.endMs > p.startMs)
}

const hours = (periods: Period[]) => periods.reduce((sum, p) => sum + (p.endMs - p.startMs), 0) / HOUR_MS

function scheduleOn(schedule: { on: string; off: string }, timeZone: string, date: LocalDate): Period[] {
  const on = minutesOfClock(schedule.on)
  const off = minutesOfClock(schedule.off)
  if (on === off) return []
  if (on < off) return [{ startMs: localToInstant(timeZone, date, on), endMs: localToInstant(timeZone, date, off) }]
  // Across midnight: this day holds the end of yesterday's period and the start of tonight's.
  const dayStart = localToInstant(timeZone, date, 0)
  const dayEnd = localToInstant(timeZone, addDays(date, 1), 0)
  return [
    { startMs: dayStart, endMs: localToInstant(timeZone, date, off) },
    { startMs: localToInstant(timeZone, date, on), endMs: dayEnd },
  ]
}

/** Each local day (in the site's zone) that the readings touch, oldest first. */
export function lightDays(samples: LightSample[], options: LightCycleOptions): LightDay[] {
  const times = samples
    .map((s) => Date.parse(s.t))
    .filter(Number.isFinite)
    .sort((a, b) => a - b)
  if (!times.length) return []
  const holdMs = options.holdMs ?? Math.max(3 * medianStepMs(times), 15 * MINUTE_MS)
  const untilMs = options.untilMs ?? times[times.length - 1]! + holdMs
  const all = spans(samples, holdMs, untilMs)
  const onSpans = all.filter((s) => s.on)

  const days: LightDay[] = []
  let date = localDateAt(options.timeZone, times[0]!)
  const lastDate = formatLocalDate(localDateAt(options.timeZone, Math.max(times[times.length - 1]!, all[all.length - 1]!.endMs - 1)))
  for (let guard = 0; guard < 400; guard++) {
    const dayStartMs = localToInstant(options.timeZone, date, 0)
    const dayEndMs = localToInstant(options.timeZone, addDays(date, 1), 0)
    const measured = clip(onSpans, dayStartMs, dayEndMs)
    const scheduled = options.schedule ? clip(scheduleOn(options.schedule, options.timeZone, date), dayStartMs, dayEndMs) : []
    days.push({
      date: formatLocalDate(date),
      dayStartMs,
      dayEndMs,
      measured,
      scheduled,
      measuredHours: hours(measured),
      scheduledHours: options.schedule ? hours(scheduled) : null,
      coveredHours: hours(clip(all, dayStartMs, dayEndMs)),
    })
    if (formatLocalDate(date) === lastDate) break
    date = addDays(date, 1)
  }
  return days
}

/** A period as left offset and width in percent of its day, for a day bar. */
export function periodBox(period: Period, day: Pick<LightDay, 'dayStartMs' | 'dayEndMs'>): { left: number; width: number } {
  const length = day.dayEndMs - day.dayStartMs
  return {
    left: (100 * (period.startMs - day.dayStartMs)) / length,
    width: (100 * (period.endMs - period.startMs)) / length,
  }
}
