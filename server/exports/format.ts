import { offsetAt } from '@shared/time/zoned'

const QUARTER_HOUR_MS = 900_000
const pad = (n: number, width = 2) => String(n).padStart(width, '0')

/**
 * Formats instants as ISO 8601 local times with the zone's offset at that instant
 * (2026-03-29T03:00:00+01:00). Zones change offset only on quarter-hour instants, so the offset is
 * looked up once per quarter hour: a long export does not ask Intl for every row.
 */
export function zonedFormatter(timeZone: string) {
  const offsets = new Map<number, number>()
  return (at: Date | null | undefined): string => {
    if (!at) return ''
    const ms = at.getTime()
    const block = Math.floor(ms / QUARTER_HOUR_MS)
    let offset = offsets.get(block)
    if (offset === undefined) {
      offset = offsetAt(timeZone, block * QUARTER_HOUR_MS)
      if (offsets.size > 10_000) offsets.clear()
      offsets.set(block, offset)
    }
    const local = new Date(ms + offset)
    const millis = local.getUTCMilliseconds()
    const sign = offset < 0 ? '-' : '+'
    const offsetMinutes = Math.abs(offset) / 60_000
    return (
      `${pad(local.getUTCFullYear(), 4)}-${pad(local.getUTCMonth() + 1)}-${pad(local.getUTCDate())}` +
      `T${pad(local.getUTCHours())}:${pad(local.getUTCMinutes())}:${pad(local.getUTCSeconds())}` +
      (millis ? `.${pad(millis, 3)}` : '') +
      `${sign}${pad(Math.floor(offsetMinutes / 60))}:${pad(offsetMinutes % 60)}`
    )
  }
}

/** A download name made only of [a-z0-9-], whatever the tank or site is called. */
export function exportFileName(parts: Array<string | number>, extension: string): string {
  const slug = parts
    .map((part) =>
      String(part)
        .normalize('NFKD')
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-+|-+$/g, '')
        .slice(0, 40),
    )
    .filter(Boolean)
    .join('-')
  return `${slug || 'export'}.${extension}`
}

/** The `Content-Disposition` for a generated, already safe file name. */
export function attachment(fileName: string): string {
  return `attachment; filename="${fileName}"`
}
