import { z } from 'zod'
import { clockTimeSchema } from '../schemas/common'
import { instantSchema as sharedInstantSchema } from '../schemas/time'

/** One weekly shift; `end` at or before `start` means it runs past midnight. */
export const weeklyShiftSchema = z.object({
  userId: z.string().min(1),
  weekday: z.number().int().min(0).max(6),
  start: clockTimeSchema,
  end: clockTimeSchema,
})
export type WeeklyShift = z.infer<typeof weeklyShiftSchema>

// An offset is required: without one, the instant would depend on the server's own zone.
const instantSchema = sharedInstantSchema

/** A one-off change: `add` puts the person on duty for the span, `remove` takes them off. */
export const rosterOverrideSchema = z
  .object({
    userId: z.string().min(1),
    startsAt: instantSchema,
    endsAt: instantSchema,
    kind: z.enum(['add', 'remove']),
  })
  .refine((o) => Date.parse(o.endsAt) > Date.parse(o.startsAt), {
    message: 'endsAt must be after startsAt',
    path: ['endsAt'],
  })
export type RosterOverride = z.infer<typeof rosterOverrideSchema>

/** A concrete stretch of duty, in epoch milliseconds, end exclusive. */
export interface DutySpan {
  userId: string
  startsAt: number
  endsAt: number
}
