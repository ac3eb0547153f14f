/**
 * Wall-clock arithmetic in an IANA time zone using only `Intl.DateTimeFormat`.
 *
 * Converting a local wall-clock time to an instant has two awkward cases, resolved so:
 * - a local time that does not exist (the hour skipped when clocks go forward) maps to the
 *   instant the gap ends, e.g. 02:30 on the spring-forward day in Europe/Berlin becomes
 *   03:00 CEST; a shift that lies wholly inside the gap therefore has no length;
 * - a local time that happens twice (the hour repeated when clocks go back) maps to its
 *   first occurrence, e.g. 02:30 on the autumn day in Europe/Berlin is 02:30 CEST.
 */

const SECOND_MS = 1000
const MINUTE_MS = 60 * SECOND_MS
const DAY_MS = 24 * 60 * MINUTE_MS

export interface LocalDate {
  year: number
  month: number
  day: number
}

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let formatter = formatters.get(timeZone)
  if (!formatter) {
    // Throws RangeError for an unknown zone, which is the right answer for a caller's typo.
    formatter = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: 'numeric',
      day: 'numeric',
      hour: 'numeric',
      minute: 'numeric',
      second: 'numeric',
    })
    formatters.set(timeZone, formatter)
  }
  return formatter
}

export function isValidTimeZone(timeZone: string): boolean {
  try {
    formatterFor(timeZone)
    return true
  } catch {
    return false
  }
}

/** The zone's wall clock at `atMs`, read as if it were UTC: local minus UTC is the offset. */
function wallClockAsUtc(timeZone: string, atMs: number): number {
  const fields: Record<string, number> = {}
  for (const part of formatterFor(timeZone).formatToParts(atMs)) {
    if (part.type !== 'literal') fields[part.type] = Number(part.value)
  }
  const hour = fields.hour === 24 ? 0 : (fields.hour ?? 0)
  return Date.UTC(fields.year ?? 1970, (fields.month ?? 1) - 1, fields.day ?? 1, hour, fields.minute ?? 0, fields.second ?? 0)
}

/** Local time minus UTC at `atMs`, in milliseconds (+3 600 000 for CET). */
export function offsetAt(timeZone: string, atMs: number): number {
  return wallClockAsUtc(timeZone, atMs) - Math.floor(atMs / SECOND_MS) * SECOND_MS
}

export function localDateAt(timeZone: string, atMs: number): LocalDate {
  const wall = new Date(wallClockAsUtc(timeZone, atMs))
  return { year: wall.getUTCFullYear(), month: wall.getUTCMonth() + 1, day: wall.getUTCDate() }
}

export function parseLocalDate(text: string): LocalDate {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text)
  const date = match ? { year: Number(match[1]), month: Number(match[2]), day: Number(match[3]) } : undefined
  if (!date || formatLocalDate(addDays(date, 0)) !== text) throw new RangeError(`not a calendar date: ${text}`)
  return date
}

export function formatLocalDate(date: LocalDate): string {
  const pad = (n: number, width: number) => String(n).padStart(width, '0')
  return `${pad(date.year, 4)}-${pad(date.month, 2)}-${pad(date.day, 2)}`
}

export function addDays(date: LocalDate, days: number): LocalDate {
  const moved = new Date(Date.UTC(date.year, date.month - 1, date.day) + days * DAY_MS)
  return { year: moved.getUTCFullYear(), month: moved.getUTCMonth() + 1, day: moved.getUTCDate() }
}

/** 0 = Monday … 6 = Sunday. */
export function weekdayOf(date: LocalDate): number {
  return (new Date(Date.UTC(date.year, date.month - 1, date.day)).getUTCDay() + 6) % 7
}

/** `'HH:MM'` to minutes after midnight. */
export function minutesOfClock(clock: string): number {
  const match = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(clock)
  if (!match) throw new RangeError(`not an HH:MM time: ${clock}`)
  return Number(match[1]) * 60 + Number(match[2])
}

/** First instant whose offset is the later one; `before` and `after` straddle one change. */
function transitionBetween(timeZone: string, before: number, after: number): number {
  const laterOffset = offsetAt(timeZone, after)
  let lo = Math.floor(before / SECOND_MS)
  let hi = Math.floor(after / SECOND_MS)
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2)
    if (offsetAt(timeZone, mid * SECOND_MS) === laterOffset) hi = mid
    else lo = mid
  }
  return hi * SECOND_MS
}

/** The instant of local wall-clock `minutes` after midnight on `date` (see the file comment). */
export function localToInstant(timeZone: string, date: LocalDate, minutes: number): number {
  const naive = Date.UTC(date.year, date.month - 1, date.day) + minutes * MINUTE_MS
  // The true instant is within a day of `naive`; the offsets a day either side cover any
  // single change near it.
  const offsets = new Set([offsetAt(timeZone, naive - DAY_MS), offsetAt(timeZone, naive), offsetAt(timeZone, naive + DAY_MS)])
  const candidates = [...offsets].map((offset) => naive - offset).sort((a, b) => a - b)
  const valid = candidates.filter((instant) => offsetAt(timeZone, instant) === naive - instant)
  if (valid.length > 0) return valid[0] as number
  return transitionBetween(timeZone, candidates[0] as number, candidates[candidates.length - 1] as number)
}
