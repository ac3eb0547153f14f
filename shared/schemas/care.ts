import { z } from 'zod'
import { clientIdSchema, idSchema } from './common'
import { CARE_TASK_KINDS } from '../care/defaults'
import { SPECIES_KEYS } from '../care/species'
import { instantSchema } from './time'
import { localDateSchema } from './time'

export { CARE_TASK_KINDS }
export const CARE_LOG_KINDS = ['water_change', 'dosing', 'livestock_in', 'livestock_out', 'equipment', 'media_change', 'note', 'task_done'] as const
export type CareLogKind = (typeof CARE_LOG_KINDS)[number]
/** `task_done` entries are written by marking a task done, never posted by hand. */
export const MANUAL_CARE_LOG_KINDS = CARE_LOG_KINDS.filter((k) => k !== 'task_done') as [
  Exclude<CareLogKind, 'task_done'>,
  ...Exclude<CareLogKind, 'task_done'>[],
]

const isoInstant = instantSchema
const localDate = localDateSchema

export const careRecurrenceSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('interval'), everyDays: z.number().int().min(1, 'at least every day').max(365) }),
  z.object({
    kind: z.literal('weekdays'),
    weekdays: z
      .array(z.number().int().min(0).max(6))
      .min(1, 'choose at least one weekday')
      .max(7)
      .refine((days) => new Set(days).size === days.length, 'each weekday once')
      .transform((days) => [...days].sort((a, b) => a - b)),
  }),
])

export const careValuesSchema = z
  .record(z.string().trim().min(1).max(40), z.union([z.number().finite(), z.string().max(200), z.boolean()]))
  .refine((values) => Object.keys(values).length <= 20, 'at most 20 values')

export const careTaskInputSchema = z.object({
  kind: z.enum(CARE_TASK_KINDS),
  title: z.string().trim().min(1).max(120).optional(),
  recurrence: careRecurrenceSchema,
  defaultValues: careValuesSchema.default({}),
  startsOn: localDate.nullable().default(null),
  active: z.boolean().default(true),
  /** A consumable of the tank's site the task uses up, and how much each time (in its unit). */
  consumableId: z.number().int().positive().max(2_147_483_647, 'no such consumable').nullable().default(null),
  consumableAmount: z.number().positive('above zero').max(100000).nullable().default(null),
})
export type CareTaskInput = z.infer<typeof careTaskInputSchema>
export const careTaskUpdateSchema = careTaskInputSchema
  .omit({ kind: true })
  .extend({ title: z.string().trim().min(1).max(120) })
  .partial()
export type CareTaskUpdate = z.infer<typeof careTaskUpdateSchema>

export const careTaskDoneSchema = z.object({
  notes: z.string().trim().max(2000).default(''),
  values: careValuesSchema.default({}),
  at: isoInstant.optional(),
  clientId: clientIdSchema.optional(),
  /**
   * The "last done" the ticker saw (null: never done). When sent, a task someone else has ticked
   * since then is answered 409 `already_done` instead of being logged twice.
   */
  seenLastDoneAt: isoInstant.nullable().optional(),
})
export type CareTaskDone = z.infer<typeof careTaskDoneSchema>

/**
 * Several tasks ticked off at once. Each names the "last done" its ticker saw, so a task that
 * someone else ticked in the meantime is reported as already done instead of logged twice.
 */
export const careTasksDoneSchema = z.object({
  tasks: z
    .array(z.object({ id: z.number().int().positive(), seenLastDoneAt: isoInstant.nullable() }))
    .min(1, 'choose at least one task')
    .max(100, 'at most 100 tasks at once')
    .refine((tasks) => new Set(tasks.map((t) => t.id)).size === tasks.length, 'each task once'),
  notes: z.string().trim().max(2000).default(''),
})
export type CareTasksDone = z.infer<typeof careTasksDoneSchema>

export const careTaskSnoozeSchema = z.object({
  until: isoInstant,
  reason: z.string().trim().min(1, 'say why').max(300),
})

export const careTodayQuerySchema = z
  .object({
    siteId: idSchema.optional(),
    mine: z
      .enum(['true', 'false'])
      .optional()
      .transform((v) => v === 'true'),
  })
  .refine((q) => (q.siteId !== undefined) !== q.mine, { message: 'give either siteId or mine=true', path: ['siteId'] })

export const careLogInputSchema = z
  .object({
    kind: z.enum(MANUAL_CARE_LOG_KINDS),
    at: isoInstant.optional(),
    text: z.string().trim().max(2000).default(''),
    values: careValuesSchema.default({}),
    clientId: clientIdSchema.optional(),
  })
  .refine((e) => e.text.length > 0 || Object.keys(e.values).length > 0, { message: 'say what was done', path: ['text'] })
export type CareLogInput = z.infer<typeof careLogInputSchema>

export const careLogQuerySchema = z.object({ from: isoInstant.optional(), to: isoInstant.optional() })

export const labelRateSchema = z.object({
  amount: z.number().positive('must be above zero').max(10000),
  unit: z.enum(['mL', 'drops', 'g']),
  per: z.enum(['L', '10L']),
})

const waterChangeAmount = {
  percent: z.number().positive('must be above zero').max(100, 'at most 100 %').optional(),
  litres: z.number().positive('must be above zero').max(100000).optional(),
  labelRate: labelRateSchema.optional(),
  newWaterTempC: z.number().min(0).max(40).optional(),
}
const oneAmount = (w: { percent?: number; litres?: number }) => (w.percent === undefined) !== (w.litres === undefined)
const oneAmountIssue = { message: 'give either percent or litres', path: ['percent'] }
export const waterChangePlanSchema = z.object(waterChangeAmount).refine(oneAmount, oneAmountIssue)
export type WaterChangePlanInput = z.infer<typeof waterChangePlanSchema>
export const waterChangeStartSchema = z.object({ ...waterChangeAmount, heaterOffConfirmed: z.boolean().default(false) }).refine(oneAmount, oneAmountIssue)
export type WaterChangeStartInput = z.infer<typeof waterChangeStartSchema>
export const waterChangeFinishSchema = z.object({
  litresReplaced: z.number().positive('must be above zero').max(100000),
  dechlorinatorMl: z.number().min(0).max(10000).optional(),
  newWaterTempC: z.number().min(0).max(40).optional(),
  notes: z.string().trim().max(2000).default(''),
})
export type WaterChangeFinishInput = z.infer<typeof waterChangeFinishSchema>
export const waterChangeCancelSchema = z.object({
  reason: z.string().trim().max(300, 'at most 300 characters').default(''),
})
export type WaterChangeCancelInput = z.infer<typeof waterChangeCancelSchema>

export const LIVESTOCK_CATEGORIES = ['fish', 'invertebrate', 'plant'] as const
export const livestockInputSchema = z
  .object({
    speciesKey: z
      .string()
      .refine((k) => SPECIES_KEYS.includes(k), 'unknown species')
      .optional(),
    name: z.string().trim().min(1).max(120).optional(),
    category: z.enum(LIVESTOCK_CATEGORIES).optional(),
    count: z.number().int().min(1, 'at least one').max(100000),
    addedAt: isoInstant.optional(),
    source: z.string().trim().max(200).default(''),
    notes: z.string().trim().max(2000).default(''),
    acclimation: z
      .object({
        bagLitres: z.number().positive('must be above zero').max(200),
        bagTempC: z.number().min(0).max(40).optional(),
        bagPh: z.number().min(3).max(11).optional(),
        intervalMinutes: z.number().min(5).max(10).optional(),
      })
      .optional(),
  })
  .refine((l) => l.speciesKey !== undefined || l.name !== undefined, { message: 'choose a species or give a name', path: ['speciesKey'] })
export type LivestockInput = z.infer<typeof livestockInputSchema>
export const livestockUpdateSchema = z
  .object({
    count: z.number().int().min(0).max(100000),
    losses: z.number().int().min(0).max(100000),
    removedAt: isoInstant.nullable(),
    notes: z.string().trim().max(2000),
  })
  .partial()
export type LivestockUpdate = z.infer<typeof livestockUpdateSchema>
