// The light-cycle bars in words: one table row per day, for someone who cannot see the bars.
import { formatClock, formatDay } from '@shared/time'
import type { LightDay, Period } from './light-cycle'

export interface LightTableRow {
  date: string
  /** "Tue 14 Jul" */
  day: string
  /** "09:00–19:00 (10.0 h)", several spans joined with commas, or "off all day". */
  measuredOn: string
  /** "09:00–19:00 (10.0 h)", or "—" without a schedule. */
  scheduled: string
  coveredHours: string
}

export const formatHours = (hours: number) => `${hours.toFixed(1)} h`

const spans = (periods: Period[], timeZone: string) => periods.map((p) => `${formatClock(p.startMs, timeZone)}–${formatClock(p.endMs, timeZone)}`).join(', ')

export function lightTableRows(days: LightDay[], timeZone: string): LightTableRow[] {
  return days.map((day) => ({
    date: day.date,
    day: formatDay(day.dayStartMs + 12 * 3_600_000, timeZone),
    measuredOn: day.measured.length ? `${spans(day.measured, timeZone)} (${formatHours(day.measuredHours)})` : 'off all day',
    scheduled:
      day.scheduledHours == null ? '—' : day.scheduled.length ? `${spans(day.scheduled, timeZone)} (${formatHours(day.scheduledHours)})` : 'off all day',
    coveredHours: formatHours(day.coveredHours),
  }))
}
