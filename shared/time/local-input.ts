import { localToInstant, parseLocalDate } from './zoned'

/**
 * Values of a `datetime-local` input ("2026-03-02T22:00"), which carries no zone: either the
 * viewer's own clock, or, where a form says "times in <zone>", the site's.
 */
const pad = (n: number) => String(n).padStart(2, '0')

/** The value a `datetime-local` input shows for an instant, in the viewer's own zone. */
export function toLocalInputValue(date: Date): string {
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`
}

/** The instant a `datetime-local` value means on the viewer's own clock; `null` when empty or unreadable. */
export function fromLocalInputValue(text: string): Date | null {
  if (!text) return null
  const date = new Date(text)
  return Number.isNaN(date.getTime()) ? null : date
}

/**
 * A `datetime-local` value read as the site's wall clock, not the viewer's: an owner away from
 * the shop who types 22:00 means the shop's 22:00. `null` for anything that is not a date-time.
 */
export function siteInputToIso(value: string, timeZone: string): string | null {
  const match = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/.exec(value)
  if (!match) return null
  try {
    const minutes = Number(match[2]) * 60 + Number(match[3])
    return new Date(localToInstant(timeZone, parseLocalDate(match[1]!), minutes)).toISOString()
  } catch {
    return null
  }
}

/** The site's wall-clock time of an instant, as a `datetime-local` value. */
export function isoToSiteInput(at: Date | string | number, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(new Date(at))
  const get = (type: string) => parts.find((p) => p.type === type)?.value ?? '00'
  return `${get('year')}-${get('month')}-${get('day')}T${get('hour')}:${get('minute')}`
}
