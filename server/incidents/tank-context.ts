import type { RuleContext } from '@shared/rules/types'

const formatters = new Map<string, Intl.DateTimeFormat>()

function minutesOfDay(atMs: number, timeZone: string): number {
  let f = formatters.get(timeZone)
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
    formatters.set(timeZone, f)
  }
  const parts = f.formatToParts(new Date(atMs))
  const hour = Number(parts.find((p) => p.type === 'hour')?.value)
  const minute = Number(parts.find((p) => p.type === 'minute')?.value)
  return hour * 60 + minute
}

const toMinutes = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5))

/** Whether the light should be on at an instant, by the tank's schedule in its site's zone. */
export function scheduleFn(schedule: { on: string; off: string }, timeZone: string) {
  const on = toMinutes(schedule.on)
  const off = toMinutes(schedule.off)
  return (atMs: number) => {
    const m = minutesOfDay(atMs, timeZone)
    if (on === off) return false
    return on < off ? m >= on && m < off : m >= on || m < off // a photoperiod past midnight
  }
}

export function ruleContextFor(tank: { heater: { topCm: number } | null; lightSchedule: { on: string; off: string } | null; timeZone: string }): RuleContext {
  return {
    heaterTopCm: tank.heater?.topCm,
    isScheduledOn: tank.lightSchedule ? scheduleFn(tank.lightSchedule, tank.timeZone) : undefined,
  }
}

type SnoozeWindow = { startsAt: Date; endsAt: Date; weekly: boolean; repeatUntil: Date | null; includeHeaterLine: boolean; cancelledAt: Date | null }

const WEEK_MS = 7 * 86400_000

/** Is this instant inside the snooze (any weekly repeat of it, up to its end)? */
export function snoozeCovers(s: SnoozeWindow, atMs: number): boolean {
  if (s.cancelledAt && s.cancelledAt.getTime() <= atMs) return false
  const start = s.startsAt.getTime()
  const length = s.endsAt.getTime() - start
  if (atMs < start) return false
  if (!s.weekly) return atMs < start + length
  if (s.repeatUntil && atMs >= s.repeatUntil.getTime()) return false
  const offset = (atMs - start) % WEEK_MS
  return offset < length
}
