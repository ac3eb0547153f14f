import { z } from 'zod'
import { REPORT_PERIOD_KINDS, type ReportPeriodKind } from '../report/period'
import { localDateSchema } from './time'
import type { ClockStyle } from './auth'

const localDate = localDateSchema

/** Which report: a week or a month, holding `date` (default today on the site's calendar). */
export const reportQuerySchema = z.object({
  period: z.enum(REPORT_PERIOD_KINDS).default('week'),
  date: localDate.optional(),
})
export type ReportQuery = z.infer<typeof reportQuerySchema>

export const MAX_REPORT_RECIPIENTS = 20

const recipientsFields = {
  emails: z.array(z.email('not an e-mail address').max(320)).max(MAX_REPORT_RECIPIENTS).default([]),
  userIds: z.array(z.number().int().positive()).max(MAX_REPORT_RECIPIENTS).default([]),
}

const scheduleFields = {
  tankId: z.number().int().positive().nullable().default(null),
  siteId: z.number().int().positive().nullable().default(null),
  /** All of one client's tanks in one mail. */
  clientId: z.number().int().positive().nullable().default(null),
  period: z.enum(REPORT_PERIOD_KINDS),
  ...recipientsFields,
  enabled: z.boolean().default(true),
}

export const reportScheduleInputSchema = z
  .object(scheduleFields)
  .refine((s) => [s.tankId, s.siteId, s.clientId].filter((v) => v !== null).length === 1, { message: 'choose one tank, site or client', path: ['tankId'] })
  .refine((s) => s.emails.length + s.userIds.length > 0, { message: 'add at least one recipient', path: ['emails'] })
export type ReportScheduleInput = z.infer<typeof reportScheduleInputSchema>
/** The body as a client sends it, before the defaults are filled in. */
export type ReportScheduleBody = z.input<typeof reportScheduleInputSchema>

/** What may change on a schedule: its recipients, period and whether it runs; not what it covers. */
export const reportScheduleUpdateSchema = z
  .object({
    period: z.enum(REPORT_PERIOD_KINDS),
    ...recipientsFields,
    enabled: z.boolean(),
  })
  .partial()
export type ReportScheduleUpdate = z.infer<typeof reportScheduleUpdateSchema>
export type ReportScheduleUpdateBody = z.input<typeof reportScheduleUpdateSchema>

export type ReportSchedule = {
  id: number
  tankId: number | null
  siteId: number | null
  clientId: number | null
  /** The tank's, the site's or the client's name. */
  subjectName: string
  period: ReportPeriodKind
  emails: string[]
  userIds: number[]
  enabled: boolean
  lastSentPeriod: string | null
  createdAt: string
}

export type ReportGap = { from: string; to: string; durationMs: number }

export type ReportMetric = {
  metric: 'temperature' | 'ph'
  label: string
  unitLabel: string
  band: { min: number | null; max: number | null } | null
  readings: number
  coveragePercent: number
  timeInBandPercent: number | null
  belowMs: number | null
  aboveMs: number | null
  min: number | null
  max: number | null
  mean: number | null
  gapLimitMs: number | null
  gaps: ReportGap[]
  /** For charts: [time ms, mean value or null where there is a gap], at most a few hundred points. */
  series: Array<[number, number | null]>
}

export type ReportIncident = {
  id: number
  title: string
  severity: string
  metric: string
  openedAt: string
  acknowledgedAt: string | null
  resolvedAt: string | null
  timeToAcknowledgeMs: number | null
  timeToResolveMs: number | null
}

export type ReportCareTask = { id: number; title: string; kind: string; due: number; done: number }

export type ReportLivestockChange = { at: string; kind: 'added' | 'removed' | 'lost'; text: string; count: number }

export type ReportPhoto = { id: number | string; takenAt: string; caption: string; url: string }

export type TankReport = {
  tankId: number
  name: string
  volumeLitres: number
  metrics: ReportMetric[]
  incidents: ReportIncident[]
  incidentSummary: { opened: number; stillOpen: number; meanTimeToAcknowledgeMs: number | null; meanTimeToResolveMs: number | null }
  care: { tasks: ReportCareTask[]; due: number; done: number }
  water: { changes: number; litres: number }
  livestock: { added: number; removed: number; lost: number; changes: ReportLivestockChange[] }
  photos: ReportPhoto[]
}

export type Report = {
  /** `clockStyle`: the organisation's clock, which the PDF and the mail write times on. */
  subject: { kind: 'tank' | 'site' | 'client'; id: number; name: string; siteId: number; siteName: string; timeZone: string; clockStyle: ClockStyle }
  period: {
    kind: ReportPeriodKind
    label: string
    startDate: string
    endDate: string
    from: string
    to: string
    previousDate: string
    nextDate: string
    /** True while the period has not ended yet: figures run up to `generatedAt`. */
    inProgress: boolean
  }
  generatedAt: string
  tanks: TankReport[]
}
