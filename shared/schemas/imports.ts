import { z } from 'zod'
import { METRIC_KEYS } from '../metrics/registry'
import { timeZoneSchema } from './common'

/**
 * How a time cell is read. `local_*` formats are wall-clock times in `timeZone`;
 * `dmy` and `mdy` differ only in whether the day or the month comes first.
 */
export const TIME_FORMATS = ['iso_offset', 'local_ymd', 'local_dmy', 'local_mdy', 'epoch_s', 'epoch_ms'] as const
export type TimeFormat = (typeof TIME_FORMATS)[number]
export const LOCAL_TIME_FORMATS: readonly TimeFormat[] = ['local_ymd', 'local_dmy', 'local_mdy']

/** An uploaded file not started within this many hours is deleted with its job (files may be 100 MB). */
export const UNSTARTED_IMPORT_HOURS = 24

export const IMPORT_STATUSES = ['uploaded', 'queued', 'running', 'done', 'cancelled', 'failed'] as const
export type ImportStatus = (typeof IMPORT_STATUSES)[number]

/** Why a row or a value of it was not stored; the codes of the rejection report. */
export const REJECTION_REASONS = [
  'unparseable_time',
  'bad_number',
  'unknown_tank',
  'implausible_value',
  'time_in_future',
  'too_old',
  'duplicate',
  'invalid',
] as const
export type RejectionReason = (typeof REJECTION_REASONS)[number]

const columnName = z.string().min(1).max(200)

export const metricColumnSchema = z.object({
  column: columnName,
  metric: z.enum(METRIC_KEYS),
  unit: z.string().min(1).max(20),
})

/** What the keeper confirmed: which column is what. Columns are named by their header text. */
export const importMappingSchema = z
  .object({
    timeColumn: columnName,
    timeFormat: z.enum(TIME_FORMATS),
    timeZone: timeZoneSchema.optional(),
    /** Site imports: the column holding each row's tank name. */
    tankColumn: columnName.optional(),
    /** Site imports without a tank column: every row goes to this tank of the site. */
    tankId: z.number().int().positive().optional(),
    metrics: z.array(metricColumnSchema).min(1, 'map at least one column to a metric').max(20),
  })
  .superRefine((m, ctx) => {
    if (LOCAL_TIME_FORMATS.includes(m.timeFormat) && !m.timeZone) {
      ctx.addIssue({ code: 'custom', path: ['timeZone'], message: 'a local time format needs a time zone' })
    }
    const used = new Set<string>([m.timeColumn, ...(m.tankColumn ? [m.tankColumn] : [])])
    m.metrics.forEach((c, i) => {
      if (used.has(c.column)) ctx.addIssue({ code: 'custom', path: ['metrics', i, 'column'], message: `column "${c.column}" is mapped twice` })
      used.add(c.column)
    })
  })
export type ImportMapping = z.infer<typeof importMappingSchema>

export const startImportSchema = z.object({
  mapping: importMappingSchema,
  /** A named source ("Logger in fish room"); its mapping is remembered for the next upload. */
  sourceName: z.string().trim().min(1).max(100).optional(),
})
export type StartImportInput = z.infer<typeof startImportSchema>

export const uploadFieldsSchema = z.object({
  sourceName: z.string().trim().min(1).max(100).optional(),
})

export interface TimeDetection {
  /** The formats every sampled cell fits; more than one means the keeper must choose. */
  candidates: TimeFormat[]
  /** Set when the day-first or month-first question cannot be answered from the file. */
  ambiguousDayOrder: boolean
  needsZone: boolean
  /** The first sampled cell read with the first candidate, as ISO 8601 UTC, for confirmation. */
  example: { raw: string; parsed: string | null } | null
}

export interface ImportPreview {
  delimiter: string
  header: string[]
  rows: string[][]
  timeColumn: string | null
  time: TimeDetection | null
  /** A mapping to start from: the remembered one of the named source, or one guessed from the headers. */
  suggested: Partial<ImportMapping> & { metrics: ImportMapping['metrics'] }
  suggestedFrom: 'source' | 'headers'
}

export interface PublicImportJob {
  id: number
  status: ImportStatus
  scope: { kind: 'tank' | 'site'; id: number; timeZone: string }
  fileName: string
  sizeBytes: number
  bytesRead: number
  sourceName: string | null
  rowsRead: number
  rowsAccepted: number
  rowsDuplicate: number
  rowsRejected: number
  error: string | null
  preview: ImportPreview | null
  hasReport: boolean
  startedAt: string | null
  finishedAt: string | null
  createdAt: string
}

export interface ImportSourceSummary {
  id: number
  name: string
  mapping: ImportMapping
  updatedAt: string
}
