import { z } from 'zod'
import { instantSchema } from './time'

/** The longest range one CSV export may cover; longer spans are exported in pieces. */
export const MAX_EXPORT_DAYS = 366
const DAY_MS = 86_400_000

const instant = instantSchema

/** `from` (inclusive) and `to` (exclusive) of a CSV export. */
export const exportRangeQuerySchema = z.object({ from: instant, to: instant }).superRefine((range, check) => {
  const from = Date.parse(range.from)
  const to = Date.parse(range.to)
  if (to <= from) check.addIssue({ code: 'custom', path: ['to'], message: 'must be after from' })
  else if (to - from > MAX_EXPORT_DAYS * DAY_MS) {
    check.addIssue({ code: 'custom', path: ['to'], message: `the range may be at most ${MAX_EXPORT_DAYS} days` })
  }
})
export type ExportRangeQuery = z.infer<typeof exportRangeQuerySchema>

export const EXPORT_KINDS = ['readings', 'incidents', 'care-log'] as const
export type ExportKind = (typeof EXPORT_KINDS)[number]

/** What the backup file says about itself; readers refuse a format or version they do not know. */
export const BACKUP_FORMAT = 'tankwarden-organization-backup'
export const BACKUP_FORMAT_VERSION = 3
/** Version 3 added service visits; a version 2 file restores without them. */
export const READABLE_BACKUP_VERSIONS = [2, 3] as const
/** The largest backup file a restore accepts. */
export const MAX_BACKUP_BYTES = 256 * 1024 * 1024

export interface RestoreSummary {
  organizationName: string
  rows: Record<string, number>
  readings: number
  notes: string[]
}
