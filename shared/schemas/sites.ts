import { z } from 'zod'
import { clockTimeSchema, timeZoneSchema } from './common'

export const siteInputSchema = z.object({
  name: z.string().trim().min(1, 'required').max(120),
  timeZone: timeZoneSchema,
  address: z.string().trim().max(300).optional().default(''),
  notes: z.string().trim().max(2000).optional().default(''),
  /** Where the working day ends on the site's clock (the overview counts the night from it); null: 18:00 assumed. */
  workdayEnd: clockTimeSchema.nullable().optional().default(null),
})
export type SiteInput = z.infer<typeof siteInputSchema>
export const siteUpdateSchema = siteInputSchema.partial()

export const siteListQuerySchema = z.object({
  includeArchived: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
})

export interface PublicSite {
  id: number
  name: string
  timeZone: string
  address: string
  notes: string
  workdayEnd: string | null
  archivedAt: string | null
  tankCount: number
}
