import { z } from 'zod'

const clock = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'a time as HH:MM')

/** Planned quiet for a site, one of its tanks, or one rule: rules keep evaluating, nobody is told. */
export const maintenanceInputSchema = z
  .object({
    reason: z.string().trim().min(3, 'say why').max(300),
    tankId: z.number().int().positive().nullable().default(null),
    ruleId: z.number().int().positive().nullable().default(null),
    repeat: z.enum(['once', 'weekly']),
    /** once: the window itself. */
    startsAt: z.iso.datetime({ offset: true }).optional(),
    endsAt: z.iso.datetime({ offset: true }).optional(),
    /** weekly, in the site's zone: 0 = Monday … 6 = Sunday. */
    weekday: z.number().int().min(0).max(6).optional(),
    start: clock.optional(),
    durationMinutes: z.number().int().min(1).max(1440).optional(),
  })
  .refine((m) => m.repeat !== 'once' || (m.startsAt && m.endsAt && new Date(m.endsAt) > new Date(m.startsAt)), {
    message: 'a one-off window needs a start and a later end',
    path: ['endsAt'],
  })
  .refine((m) => m.repeat !== 'once' || !m.startsAt || !m.endsAt || new Date(m.endsAt).getTime() - new Date(m.startsAt).getTime() <= 7 * 86400_000, {
    message: 'at most 7 days at a time',
    path: ['endsAt'],
  })
  .refine((m) => m.repeat !== 'weekly' || (m.weekday !== undefined && m.start !== undefined && m.durationMinutes !== undefined), {
    message: 'a weekly window needs a weekday, a start and a duration',
    path: ['weekday'],
  })
export type MaintenanceInput = z.output<typeof maintenanceInputSchema>

export const maintenanceRangeSchema = z.object({
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
})

export interface PublicMaintenanceWindow {
  id: number
  siteId: number
  tankId: number | null
  ruleId: number | null
  reason: string
  repeat: 'once' | 'weekly'
  startsAt: string | null
  endsAt: string | null
  weekday: number | null
  start: string | null
  durationMinutes: number | null
  /** Occurrences inside the asked range (a week by default), as ISO instants. */
  occurrences: Array<{ startsAt: string; endsAt: string }>
}
