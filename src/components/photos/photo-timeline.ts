import type { PublicPhoto } from '@shared/schemas/photos'

export type PhotoDay = { day: string; label: string; photos: PublicPhoto[] }

const dayKeyFormatters = new Map<string, Intl.DateTimeFormat>()
function dayKey(iso: string, timeZone: string): string {
  let format = dayKeyFormatters.get(timeZone)
  if (!format) {
    // en-CA writes dates as YYYY-MM-DD, which also sorts as text.
    format = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' })
    dayKeyFormatters.set(timeZone, format)
  }
  return format.format(new Date(iso))
}

/** Photos grouped by the calendar day they were taken in the site's zone, newest day and photo first. */
export function photosByDay(photos: PublicPhoto[], timeZone: string, labelOf: (iso: string) => string): PhotoDay[] {
  const days = new Map<string, PublicPhoto[]>()
  const sorted = [...photos].sort((a, b) => Date.parse(b.takenAt) - Date.parse(a.takenAt) || b.id - a.id)
  for (const photo of sorted) {
    const key = dayKey(photo.takenAt, timeZone)
    const list = days.get(key)
    if (list) list.push(photo)
    else days.set(key, [photo])
  }
  return [...days].map(([day, list]) => ({ day, label: labelOf(list[0]!.takenAt), photos: list }))
}

export const ACCEPTED_PHOTO_TYPES = 'image/jpeg,image/png,image/webp'

/** The default taken-at for a chosen file: its modified time when that is a plausible past instant. */
export function takenAtGuess(file: File, now = Date.now()): Date {
  const modified = file.lastModified
  return Number.isFinite(modified) && modified > 0 && modified <= now ? new Date(modified) : new Date(now)
}
