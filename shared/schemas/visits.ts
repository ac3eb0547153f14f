import { z } from 'zod'
import { idSchema } from './common'
import type { KitVerdict } from '../care/kit-verdict'
import type { KitValue } from './test-kit'
import { instantSchema, localDateSchema } from './time'
import type { CareDueStatus } from '../care/due'

export const VISIT_STATES = ['planned', 'started', 'closed'] as const
export type VisitState = (typeof VISIT_STATES)[number]

const id = z.number().int().positive()
const windowRefine = (v: { startsAt?: string; endsAt?: string }) => !v.startsAt || !v.endsAt || Date.parse(v.endsAt) > Date.parse(v.startsAt)

const visitFields = {
  clientId: id,
  siteId: id,
  technicianId: id,
  startsAt: instantSchema,
  endsAt: instantSchema,
  tankIds: z.array(id).min(1, 'choose at least one tank').max(100),
  notes: z.string().trim().max(4000).default(''),
}
export const visitInputSchema = z.object(visitFields).refine(windowRefine, { message: 'must be after the start', path: ['endsAt'] })
export type VisitInput = z.infer<typeof visitInputSchema>
export type VisitBody = z.input<typeof visitInputSchema>
export const visitUpdateSchema = z
  .object(visitFields)
  .partial()
  .refine(windowRefine, { message: 'must be after the start', path: ['endsAt'] })
export type VisitUpdate = z.infer<typeof visitUpdateSchema>

export const visitListQuerySchema = z.object({
  clientId: idSchema.optional(),
  state: z.enum(VISIT_STATES).optional(),
})

/** A technician's day: `date` on the calendar of the business's first site, default today. */
export const roundQuerySchema = z.object({
  technicianId: idSchema.optional(),
  date: localDateSchema.optional(),
})

/** What was used on a visit: litres of water changed, a filter sponge, 250 mL of carbon… */
export const visitMaterialSchema = z.object({
  what: z.string().trim().min(1, 'required').max(120),
  amount: z.number({ error: 'enter a number' }).finite().min(0).max(100000),
  unit: z.string().trim().max(20).default(''),
})
export type VisitMaterial = z.infer<typeof visitMaterialSchema>

/** Closing a visit: per tank the tasks ticked, the test-kit entry made there and a note; the rest for the visit. */
export const visitCloseSchema = z.object({
  arrivedAt: instantSchema.optional(),
  leftAt: instantSchema.optional(),
  notes: z.string().trim().max(4000).default(''),
  materials: z.array(visitMaterialSchema).max(50).default([]),
  photoIds: z.array(id).max(100).default([]),
  tanks: z
    .array(
      z.object({
        tankId: id,
        doneTaskIds: z.array(id).max(100).default([]),
        kitEntryId: id.nullable().default(null),
        notes: z.string().trim().max(2000).default(''),
      }),
    )
    .max(100)
    .default([]),
})
export type VisitClose = z.infer<typeof visitCloseSchema>
export type VisitCloseBody = z.input<typeof visitCloseSchema>

/** What was done at one tank, kept on the visit when it closes. */
export interface VisitTankWork {
  tankId: number
  tankName: string
  doneTasks: Array<{ id: number; title: string }>
  kitEntryId: number | null
  readings: Array<KitValue & { verdict: KitVerdict['verdict']; summary: string }>
  notes: string
  /** The next care due on this tank after the visit: title and local date. */
  next: Array<{ title: string; dueDate: string }>
}

export interface PublicVisit {
  id: number
  clientId: number
  clientName: string
  siteId: number
  siteName: string
  siteAddress: string
  timeZone: string
  technician: { id: number; name: string }
  startsAt: string
  endsAt: string
  tanks: Array<{ id: number; name: string }>
  state: VisitState
  arrivedAt: string | null
  leftAt: string | null
  notes: string
  materials: VisitMaterial[]
  work: VisitTankWork[]
  photoIds: number[]
  closedAt: string | null
  /** Not closed though its day has ended on the site's clock. */
  overdue: boolean
}

/** A due care task at a stop, for the checklist and the round. */
export interface VisitDueTask {
  id: number
  tankId: number
  title: string
  status: CareDueStatus
  dueDate: string | null
  lastDoneAt: string | null
}

/** A stop of a round, or the visit opened on the phone: the visit and the care due at each tank. */
export interface VisitSheet extends PublicVisit {
  due: VisitDueTask[]
}

export interface Round {
  date: string
  technician: { id: number; name: string }
  stops: VisitSheet[]
}
