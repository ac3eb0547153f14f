/**
 * Instants as text on a site's clock, for the screens, the mails and the PDFs alike: a fish
 * room's 06:00 is its own, whoever reads it and wherever the server runs.
 */
import type { ClockStyle } from '../schemas/auth'

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string | undefined, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${timeZone ?? ''}|${JSON.stringify(options)}`
  let format = formatters.get(key)
  if (!format) {
    try {
      format = new Intl.DateTimeFormat('en-GB', { ...options, timeZone })
    } catch {
      // An unknown zone name falls back to the reader's own rather than breaking the page.
      format = new Intl.DateTimeFormat('en-GB', options)
    }
    formatters.set(key, format)
  }
  return format
}

export type Instant = Date | string | number

const toDate = (value: Instant) => (value instanceof Date ? value : new Date(value))
const CLOCKS = {
  '24h': { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' },
  '12h': { hour: 'numeric', minute: '2-digit', hourCycle: 'h12' },
} as const satisfies Record<ClockStyle, Intl.DateTimeFormatOptions>
let clockStyle: ClockStyle = '24h'

/**
 * How every clock time this module writes reads when no style is passed: "14:05" or "2:05 pm". The
 * client sets its organisation's choice once signed in. The server serves many organisations at once,
 * so its mails and PDFs pass the organisation's style to each call (the last argument) instead.
 */
export function setClockStyle(style: ClockStyle) {
  clockStyle = style
}

const clock = (style: ClockStyle = clockStyle) => CLOCKS[style]

/** "14:05", or "2:05 pm" on a 12-hour clock */
export function formatClock(value: Instant, timeZone?: string, style?: ClockStyle): string {
  return formatter(timeZone, clock(style)).format(toDate(value))
}

/** "3 Mar, 14:05" */
export function formatDateTime(value: Instant | null | undefined, timeZone?: string, style?: ClockStyle): string {
  if (value == null) return '—'
  return formatter(timeZone, { day: 'numeric', month: 'short', ...clock(style) }).format(toDate(value))
}

/** A time of day as stored ("07:00", "19:30") in the clock style: "07:00", or "7:00 am". */
export function formatTimeOfDay(hhmm: string, style: ClockStyle = clockStyle): string {
  const match = /^(\d{2}):(\d{2})$/.exec(hhmm)
  if (!match || style === '24h') return hhmm
  const hour = Number(match[1]) % 24
  return `${hour % 12 === 0 ? 12 : hour % 12}:${match[2]} ${hour < 12 ? 'am' : 'pm'}`
}

/** "Tue 3 Mar, 14:05" */
export function formatDayTime(value: Instant, timeZone?: string, style?: ClockStyle): string {
  return formatter(timeZone, { weekday: 'short', day: 'numeric', month: 'short', ...clock(style) }).format(toDate(value))
}

/** "2026" on the zone's calendar */
export function formatYear(value: Instant, timeZone?: string): string {
  return formatter(timeZone, { year: 'numeric' }).format(toDate(value))
}

/**
 * The zone's short name at that instant ("CET", "CEST", "GMT-5"), so a time read by someone in
 * another zone says whose clock it is on. Without a zone, the reader's own.
 */
export function zoneAbbreviation(value: Instant, timeZone?: string): string {
  const part = formatter(timeZone, { timeZoneName: 'short' })
    .formatToParts(toDate(value))
    .find((p) => p.type === 'timeZoneName')
  return part?.value ?? timeZone ?? ''
}

/** "3 Mar, 14:05 CET": a date and time that names its zone. */
export function formatZonedDateTime(value: Instant | null | undefined, timeZone?: string, style?: ClockStyle): string {
  if (value == null) return '—'
  return `${formatDateTime(value, timeZone, style)} ${zoneAbbreviation(value, timeZone)}`
}

/** "14:05 CET" */
export function formatZonedClock(value: Instant, timeZone?: string, style?: ClockStyle): string {
  return `${formatClock(value, timeZone, style)} ${zoneAbbreviation(value, timeZone)}`
}

/** "Tue 3 Mar" */
export function formatDay(value: Instant, timeZone?: string): string {
  return formatter(timeZone, { weekday: 'short', day: 'numeric', month: 'short' }).format(toDate(value))
}

/** "3 Mar 2026" */
export function formatCalendarDay(value: Instant, timeZone?: string): string {
  return formatter(timeZone, { day: 'numeric', month: 'short', year: 'numeric' }).format(toDate(value))
}

/**
 * "Sun, 25 Oct 2026, 02:30 GMT+1": a moment with the UTC offset, so a shift change or a clock
 * change is unambiguous in a mail read days later.
 */
export function formatInZone(iso: string, timeZone: string, style?: ClockStyle): string {
  const moment = new Date(iso)
  if (Number.isNaN(moment.getTime())) throw new RangeError(`Not an ISO time: ${iso}`)
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    ...clock(style),
    timeZoneName: 'shortOffset',
  }).format(moment)
}

/** "2 min ago", "just now", "3 h ago", "2 days ago". */
export function formatAge(iso: string | null | undefined, now: number): string {
  if (!iso) return 'no readings'
  const seconds = Math.max(0, Math.round((now - Date.parse(iso)) / 1000))
  if (seconds < 45) return 'just now'
  const minutes = Math.round(seconds / 60)
  if (minutes < 60) return `${minutes} min ago`
  const hours = Math.round(minutes / 60)
  if (hours < 48) return `${hours} h ago`
  return `${Math.round(hours / 24)} days ago`
}

/** "3 h 05 min", "12 min", "2 d 4 h": how long something has been going on. */
export function formatDuration(ms: number): string {
  const minutes = Math.max(0, Math.floor(ms / 60_000))
  const days = Math.floor(minutes / 1440)
  const hours = Math.floor((minutes % 1440) / 60)
  const mins = minutes % 60
  if (days) return `${days} d ${hours} h`
  if (hours) return `${hours} h ${String(mins).padStart(2, '0')} min`
  return `${mins} min`
}
