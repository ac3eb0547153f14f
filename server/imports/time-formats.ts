import { localToInstant } from '@shared/time/zoned'
import { LOCAL_TIME_FORMATS, type TimeDetection, type TimeFormat } from '@shared/schemas/imports'

const ISO_OFFSET = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:?\d{2})$/i
const LOCAL_YMD = /^(\d{4})-(\d{1,2})-(\d{1,2})(?:[T ](\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?)?$/
// Day-first and month-first look alike: 03/04/2026 14:05, 03.04.2026, 3-4-2026.
const LOCAL_SLASHED = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{4})(?:[T ,]+(\d{1,2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?)?$/
const EPOCH_S = /^\d{9,10}(\.\d+)?$/
const EPOCH_MS = /^\d{12,13}$/

type Parts = { year: number; month: number; day: number; hour: number; minute: number; second: number }

function validParts(p: Parts): Parts | null {
  if (p.month < 1 || p.month > 12 || p.day < 1 || p.hour > 23 || p.minute > 59 || p.second > 59) return null
  const probe = new Date(Date.UTC(p.year, p.month - 1, p.day))
  return probe.getUTCDate() === p.day ? p : null
}

function localParts(text: string, format: TimeFormat): Parts | null {
  if (format === 'local_ymd') {
    const m = LOCAL_YMD.exec(text)
    if (!m) return null
    return validParts({ year: +m[1]!, month: +m[2]!, day: +m[3]!, hour: +(m[4] ?? 0), minute: +(m[5] ?? 0), second: +(m[6] ?? 0) })
  }
  const m = LOCAL_SLASHED.exec(text)
  if (!m) return null
  const [first, second] = [+m[1]!, +m[2]!]
  const [day, month] = format === 'local_dmy' ? [first, second] : [second, first]
  return validParts({ year: +m[3]!, month, day, hour: +(m[4] ?? 0), minute: +(m[5] ?? 0), second: +(m[6] ?? 0) })
}

/**
 * Reads time cells of one format in one zone into instants. Local times are converted through
 * the zone's offset at the start of their local hour, cached, because a year of minute readings
 * has only some 8 760 distinct hours (zones that change their clocks at half past are rare and
 * read within the hour of the change as the offset at its start).
 */
export function createTimeReader(format: TimeFormat, timeZone = 'UTC') {
  const hourStarts = new Map<string, number>()
  return (raw: string): number | null => {
    const text = raw.trim()
    switch (format) {
      case 'iso_offset': {
        if (!ISO_OFFSET.test(text)) return null
        const ms = Date.parse(text.replace(' ', 'T').replace(/([+-]\d{2})(\d{2})$/, '$1:$2'))
        return Number.isNaN(ms) ? null : ms
      }
      case 'epoch_s':
        return EPOCH_S.test(text) ? Math.round(Number(text) * 1000) : null
      case 'epoch_ms':
        return EPOCH_MS.test(text) ? Number(text) : null
      default: {
        const p = localParts(text, format)
        if (!p) return null
        const key = `${p.year}-${p.month}-${p.day}-${p.hour}`
        let start = hourStarts.get(key)
        if (start === undefined) {
          start = localToInstant(timeZone, { year: p.year, month: p.month, day: p.day }, p.hour * 60)
          hourStarts.set(key, start)
        }
        return start + p.minute * 60_000 + p.second * 1000
      }
    }
  }
}

const ALL: TimeFormat[] = ['iso_offset', 'epoch_ms', 'epoch_s', 'local_ymd', 'local_dmy', 'local_mdy']

/**
 * The formats that read the most sampled cells (at least half of them: a stray bad row must not
 * hide the format); day-first against month-first is left open when no cell decides it.
 */
export function detectTimeFormat(samples: string[], timeZone = 'UTC'): TimeDetection | null {
  const cells = samples.map((s) => s.trim()).filter(Boolean)
  if (!cells.length) return null
  const fits = ALL.map((format) => {
    const read = createTimeReader(format, timeZone)
    return { format, count: cells.filter((cell) => read(cell) !== null).length }
  })
  const best = Math.max(...fits.map((f) => f.count))
  if (best === 0 || best < cells.length / 2) return null
  const candidates = fits.filter((f) => f.count === best).map((f) => f.format)
  const ambiguousDayOrder = candidates.includes('local_dmy') && candidates.includes('local_mdy')
  const first = candidates[0]!
  const read = createTimeReader(first, timeZone)
  const example = cells.find((cell) => read(cell) !== null)!
  return {
    candidates,
    ambiguousDayOrder,
    needsZone: LOCAL_TIME_FORMATS.includes(first),
    example: { raw: example, parsed: new Date(read(example)!).toISOString() },
  }
}

export const looksLikeTime = (cell: string) => ALL.some((f) => createTimeReader(f)(cell) !== null)
