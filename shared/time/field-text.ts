/**
 * What a person types into a date or time field, read back as the values forms keep
 * (`YYYY-MM-DD`, `HH:MM`), and those values written the way the rest of the product shows them:
 * "Tue 3 Mar 2026", "15:05" or "3:05 pm" by the organisation's clock. Days are read day first,
 * as they are shown; an ISO date is read as it is.
 */
import type { ClockStyle } from '../schemas/auth'
import { formatDay, formatTimeOfDay, formatYear } from './format'

const MONTHS = ['jan', 'feb', 'mar', 'apr', 'may', 'jun', 'jul', 'aug', 'sep', 'oct', 'nov', 'dec']
const pad = (n: number) => String(n).padStart(2, '0')

function validDay(year: number, month: number, day: number): string | null {
  const at = new Date(Date.UTC(year, month - 1, day))
  if (year < 1970 || year > 2199 || at.getUTCMonth() !== month - 1 || at.getUTCDate() !== day) return null
  return `${year}-${pad(month)}-${pad(day)}`
}

/** "Tue 3 Mar 2026" for a calendar date `YYYY-MM-DD` ('' when there is none). */
export function formatDayValue(date: string): string {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) return ''
  const noon = `${date}T12:00:00Z`
  return `${formatDay(noon, 'UTC')} ${formatYear(noon, 'UTC')}`
}

/**
 * `YYYY-MM-DD` from "2026-03-03", "3 Mar 2026", "Tue 3 March 2026", "3/3/2026" or "3.3.26" (day
 * first); a day without a year is in `fallbackYear`. Null for anything else or a day that does not exist.
 */
export function parseDayText(text: string, fallbackYear = new Date().getFullYear()): string | null {
  const t = text.trim().toLowerCase().replace(/,/g, ' ')
  const iso = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(t)
  if (iso) return validDay(Number(iso[1]), Number(iso[2]), Number(iso[3]))
  const numeric = /^(\d{1,2})[./-](\d{1,2})(?:[./-](\d{2}|\d{4}))?$/.exec(t)
  if (numeric) return validDay(fullYear(numeric[3], fallbackYear), Number(numeric[2]), Number(numeric[1]))
  const named = /^(?:[a-z]+\s+)?(\d{1,2})\s+([a-z]+)\.?(?:\s+(\d{2}|\d{4}))?$/.exec(t.replace(/\s+/g, ' '))
  if (!named) return null
  const month = MONTHS.indexOf(named[2]!.slice(0, 3)) + 1
  return month ? validDay(fullYear(named[3], fallbackYear), month, Number(named[1])) : null
}

const fullYear = (text: string | undefined, fallback: number) => (text === undefined ? fallback : text.length === 2 ? 2000 + Number(text) : Number(text))

/** A stored time of day on the organisation's clock: "15:05" or "3:05 pm". */
export function formatClockValue(hhmm: string, style?: ClockStyle): string {
  return /^\d{2}:\d{2}$/.test(hhmm) ? formatTimeOfDay(hhmm, style) : ''
}

/** `HH:MM` from "15:05", "1505", "3:05 pm", "3pm", "3.05 p.m." or "12 am"; null otherwise. */
export function parseClockText(text: string): string | null {
  const m = /^(\d{1,2})(?:[:.h]?(\d{2}))?(?:\s*([ap])\.?\s*m?\.?)?$/.exec(text.trim().toLowerCase())
  if (!m) return null
  let hour = Number(m[1])
  const minute = Number(m[2] ?? 0)
  if (minute > 59) return null
  if (m[3]) {
    if (hour < 1 || hour > 12) return null
    hour = (hour % 12) + (m[3] === 'p' ? 12 : 0)
  } else if (hour > 23) return null
  return `${pad(hour)}:${pad(minute)}`
}
