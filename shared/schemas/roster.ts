import { z } from 'zod'
import { rosterOverrideSchema, weeklyShiftSchema } from '../roster'
import { idSchema } from './common'
import { localDateSchema } from './time'

/** A person who may be on duty; the service checks they belong to the organization, are active and are not a viewer. */
const dutyUserIdSchema = z.number().int().positive()
const { startsAt: instantSchema, kind: overrideKindSchema } = rosterOverrideSchema.shape

/** One weekly shift; `end` at or before `start` runs past midnight, so `end` equal to `start` is a full day. */
export const shiftInputSchema = weeklyShiftSchema.extend({ userId: dutyUserIdSchema })
export type ShiftInput = z.infer<typeof shiftInputSchema>
export const shiftUpdateSchema = shiftInputSchema.partial()

const bothInstants = (a: unknown, b: unknown) => instantSchema.safeParse(a).success && instantSchema.safeParse(b).success

export const overrideInputSchema = z
  .object({
    userId: dutyUserIdSchema,
    kind: overrideKindSchema,
    startsAt: instantSchema,
    endsAt: instantSchema,
    note: z.string().trim().max(500).optional().default(''),
  })
  // A malformed instant is already reported under its own name; only compare two good ones.
  .refine((o) => !bothInstants(o.startsAt, o.endsAt) || Date.parse(o.endsAt) > Date.parse(o.startsAt), {
    message: 'endsAt must be after startsAt',
    path: ['endsAt'],
  })
export type OverrideInput = z.infer<typeof overrideInputSchema>

/** Overrides overlapping `[from, to)`; without `from`, those not yet over. */
export const overrideListQuerySchema = z
  .object({ from: instantSchema.optional(), to: instantSchema.optional() })
  .refine((q) => !bothInstants(q.from, q.to) || Date.parse(q.to as string) > Date.parse(q.from as string), { message: 'to must be after from', path: ['to'] })

export const onDutyQuerySchema = z.object({ at: instantSchema.optional() })

export const rosterWeekQuerySchema = z.object({ start: localDateSchema })

export const backupInputSchema = z.object({ userId: dutyUserIdSchema.nullable() })

export const shiftParamsSchema = z.object({ id: idSchema, shiftId: idSchema })
export const overrideParamsSchema = z.object({ id: idSchema, overrideId: idSchema })

export interface PublicShift {
  id: number
  siteId: number
  userId: number
  userName: string
  /** 0 = Monday … 6 = Sunday. */
  weekday: number
  start: string
  end: string
}

export interface PublicOverride {
  id: number
  siteId: number
  userId: number
  userName: string
  kind: 'add' | 'remove'
  startsAt: string
  endsAt: string
  note: string
  createdBy: number | null
}

export interface DutyContact {
  userId: number
  name: string
  email: string
}

export interface OnDutyResponse {
  siteId: number
  at: string
  timeZone: string
  onDuty: DutyContact[]
  /** Who hears about alerts when nobody is on duty: the site's backup, or else the first active owner. */
  backup: DutyContact | null
  usingBackup: boolean
}

export interface RosterWeekSpan {
  userId: number
  name: string
  startsAt: string
  endsAt: string
  /** `override` marks stretches that exist only because of an `add` override. */
  source: 'pattern' | 'override'
}

export interface RosterWeekResponse {
  weekStart: string
  timeZone: string
  spans: RosterWeekSpan[]
}

export interface RosterBackupResponse {
  siteId: number
  /** The chosen backup; null means the default (the organization's first active owner). */
  backupUserId: number | null
  backup: DutyContact | null
}
