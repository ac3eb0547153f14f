import { z } from 'zod'

/** PostgreSQL's integer, the type of every id column: a larger id names no row and is refused as bad input. */
export const MAX_ID = 2_147_483_647
export const idSchema = z.coerce.number().int().positive().max(MAX_ID, 'no such id')
export const idParamsSchema = z.object({ id: idSchema })

/**
 * An id a phone makes for an entry before sending it (a UUID): sending the entry again with the
 * same id answers as the first time and stores nothing more, so a resend after a lost answer is safe.
 */
export const clientIdSchema = z.uuid('must be a UUID')

/** `HH:MM`, 24-hour local wall-clock time. */
export const clockTimeSchema = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'use HH:MM (24-hour)')

export const timeZoneSchema = z
  .string()
  .min(1)
  .refine((zone) => {
    try {
      new Intl.DateTimeFormat('en', { timeZone: zone })
      return true
    } catch {
      return false
    }
  }, 'unknown time zone')

export const pageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  search: z.string().trim().max(100).optional(),
})

/** The one error shape every API error answers with. */
export interface ApiErrorBody {
  error: { code: string; message: string; fields?: Record<string, string>; retryAfterSeconds?: number; details?: Record<string, unknown> }
}

export interface Page<T> {
  items: T[]
  total: number
  page: number
  pageSize: number
}
