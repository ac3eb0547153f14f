// Wall-clock time at a site, from an instant and an IANA zone, through Intl only.

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let formatter = formatters.get(timeZone)
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-GB', {
      timeZone,
      hourCycle: 'h23',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    })
    formatters.set(timeZone, formatter)
  }
  return formatter
}

/** Minutes since local midnight (fractional, seconds included) at `epochMs` in `timeZone`. */
export function localMinutesOfDay(epochMs: number, timeZone: string): number {
  let hour = 0
  let minute = 0
  let second = 0
  for (const part of formatterFor(timeZone).formatToParts(new Date(epochMs))) {
    if (part.type === 'hour') hour = Number(part.value)
    else if (part.type === 'minute') minute = Number(part.value)
    else if (part.type === 'second') second = Number(part.value)
  }
  const milliseconds = ((epochMs % 1000) + 1000) % 1000
  return hour * 60 + minute + (second + milliseconds / 1000) / 60
}

/** `HH:MM` → minutes since midnight. */
export function parseClockTime(text: string): number {
  const match = /^([01]\d|2[0-3]):([0-5]\d)$/.exec(text)
  if (!match) throw new RangeError(`clock time must be HH:MM (got '${text}')`)
  return Number(match[1]) * 60 + Number(match[2])
}

export const MINUTES_PER_DAY = 24 * 60

/** Minutes from `from` forward to `to` on a 24-hour dial, in [0, 1440). */
export function minutesAfter(from: number, to: number): number {
  return (((to - from) % MINUTES_PER_DAY) + MINUTES_PER_DAY) % MINUTES_PER_DAY
}
