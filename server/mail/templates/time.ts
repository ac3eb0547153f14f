/** A moment as the site's clock shows it, with the UTC offset so a shift change or DST is unambiguous. */
export function formatInZone(iso: string, timeZone: string): string {
  const moment = new Date(iso)
  if (Number.isNaN(moment.getTime())) throw new RangeError(`Not an ISO time: ${iso}`)
  return new Intl.DateTimeFormat('en-GB', {
    timeZone,
    weekday: 'short',
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZoneName: 'shortOffset',
  }).format(moment)
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
