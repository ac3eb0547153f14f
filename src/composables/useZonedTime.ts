/** Times are shown in the site's zone, not the viewer's: a fish room's 06:00 is its own. */
const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string | undefined, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  const key = `${timeZone ?? ''}|${JSON.stringify(options)}`
  let format = formatters.get(key)
  if (!format) {
    try {
      format = new Intl.DateTimeFormat('en-GB', { ...options, timeZone })
    } catch {
      // An unknown zone name falls back to the viewer's own rather than breaking the screen.
      format = new Intl.DateTimeFormat('en-GB', options)
    }
    formatters.set(key, format)
  }
  return format
}

const toDate = (value: Date | string | number) => (value instanceof Date ? value : new Date(value))

/** "14:05" */
export function formatClock(value: Date | string | number, timeZone?: string): string {
  return formatter(timeZone, { hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(toDate(value))
}

/** "3 Mar, 14:05" */
export function formatDateTime(value: Date | string | number | null | undefined, timeZone?: string): string {
  if (value == null) return '—'
  return formatter(timeZone, { day: 'numeric', month: 'short', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(toDate(value))
}

/**
 * The zone's short name at that instant ("CET", "CEST", "GMT-5"), so a time read by someone in
 * another zone says whose clock it is on. Without a zone, the viewer's own.
 */
export function zoneAbbreviation(value: Date | string | number, timeZone?: string): string {
  const part = formatter(timeZone, { timeZoneName: 'short' }).formatToParts(toDate(value)).find((p) => p.type === 'timeZoneName')
  return part?.value ?? timeZone ?? ''
}

/** "3 Mar, 14:05 CET": a date and time that names its zone. */
export function formatZonedDateTime(value: Date | string | number | null | undefined, timeZone?: string): string {
  if (value == null) return '—'
  return `${formatDateTime(value, timeZone)} ${zoneAbbreviation(value, timeZone)}`
}

/** "14:05 CET" */
export function formatZonedClock(value: Date | string | number, timeZone?: string): string {
  return `${formatClock(value, timeZone)} ${zoneAbbreviation(value, timeZone)}`
}

/** "Tue 3 Mar" */
export function formatDay(value: Date | string | number, timeZone?: string): string {
  return formatter(timeZone, { weekday: 'short', day: 'numeric', month: 'short' }).format(toDate(value))
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

/** The value a `datetime-local` input shows for an instant, in the viewer's own zone. */
export function toLocalInputValue(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`
}

export function fromLocalInputValue(text: string): Date | null {
  if (!text) return null
  const date = new Date(text)
  return Number.isNaN(date.getTime()) ? null : date
}
