import { z } from 'zod'
import { clockTimeSchema, idSchema, pageQuerySchema } from './common'
import { METRIC_KEYS } from '../metrics/registry'
import type { TankStatus } from './tank-status'

export const TANK_KINDS = ['tropical_freshwater', 'planted', 'coldwater', 'brackish', 'marine'] as const
export type TankKind = (typeof TANK_KINDS)[number]
export const TANK_KIND_LABELS: Record<TankKind, string> = {
  tropical_freshwater: 'Tropical freshwater',
  planted: 'Planted',
  coldwater: 'Coldwater',
  brackish: 'Brackish',
  marine: 'Marine',
}

export const TANK_STAGES = ['cycling', 'established', 'quarantine', 'empty'] as const
export type TankStage = (typeof TANK_STAGES)[number]
export const TANK_STAGE_LABELS: Record<TankStage, string> = {
  cycling: 'New and cycling',
  established: 'Established',
  quarantine: 'Quarantine',
  empty: 'Empty',
}

const cm = (max: number) => z.number().positive('must be above zero').max(max, `at most ${max} cm`)

/** Inside dimensions in centimetres; field names match shared/chemistry/volume's TankShape. */
export const tankShapeSchema = z.discriminatedUnion('shape', [
  z.object({ shape: z.literal('rectangular'), lengthCm: cm(1000), widthCm: cm(500), heightCm: cm(300) }),
  z.object({ shape: z.literal('cylinder'), diameterCm: cm(500), heightCm: cm(300) }),
  z.object({
    shape: z.literal('bow_front'),
    lengthCm: cm(1000),
    widthCm: cm(500),
    bowCm: cm(200),
    heightCm: cm(300),
  }),
])
export type TankShapeInput = z.infer<typeof tankShapeSchema>

export const heaterSchema = z.object({
  watts: z.number().positive('must be above zero').max(5000),
  setPointC: z.number().min(5).max(35),
  /** Height of the top of the heater above the tank floor, cm. */
  topCm: z.number().min(0).max(300),
})

export const lightScheduleSchema = z.object({ on: clockTimeSchema, off: clockTimeSchema })

export const targetBandSchema = z
  .object({ min: z.number(), max: z.number() })
  .refine((b) => b.min <= b.max, { message: 'min must not exceed max', path: ['max'] })
export type TargetBand = z.infer<typeof targetBandSchema>
export const targetsSchema = z.partialRecord(z.enum(METRIC_KEYS), targetBandSchema)
export type Targets = z.infer<typeof targetsSchema>

const tankFields = {
  name: z.string().trim().min(1, 'required').max(120),
  siteId: z.number().int().positive('choose a site'),
  /** The client who owns the tank, for a tank-care business; none for the business's own tanks. */
  clientId: z.number().int().positive().nullable().optional(),
  kind: z.enum(TANK_KINDS),
  stage: z.enum(TANK_STAGES),
  dimensions: tankShapeSchema.nullable().default(null),
  /** Entered directly when dimensions are unknown; computed from dimensions otherwise. */
  volumeLitres: z.number().positive('must be above zero').max(100000).nullable().default(null),
  substrateDepthCm: z.number().min(0).max(50).default(0),
  heater: heaterSchema.nullable().default(null),
  filter: z.string().trim().max(200).default(''),
  media: z.string().trim().max(300).default(''),
  lightSchedule: lightScheduleSchema.nullable().default(null),
  targets: targetsSchema.optional(),
  notes: z.string().trim().max(4000).default(''),
  sortOrder: z.number().int().min(0).max(100000).default(0),
}

function volumeKnown(t: { dimensions?: unknown; volumeLitres?: number | null }) {
  return t.dimensions != null || t.volumeLitres != null
}

export const tankInputSchema = z
  .object(tankFields)
  .refine(volumeKnown, { message: 'give the dimensions or the volume', path: ['volumeLitres'] })
  .refine((t) => !t.heater || !t.dimensions || t.heater.topCm <= t.dimensions.heightCm, {
    message: 'the heater top cannot be above the tank',
    path: ['heater', 'topCm'],
  })
export type TankInput = z.infer<typeof tankInputSchema>
export const tankUpdateSchema = z.object(tankFields).partial()
export type TankUpdate = z.infer<typeof tankUpdateSchema>

export const TANK_SORT_KEYS = ['name', 'site', 'kind', 'stage', 'volume', 'updated'] as const
export const tankListQuerySchema = pageQuerySchema.extend({
  siteId: idSchema.optional(),
  clientId: idSchema.optional(),
  stage: z.enum(TANK_STAGES).optional(),
  kind: z.enum(TANK_KINDS).optional(),
  sortBy: z.enum(TANK_SORT_KEYS).default('name'),
  sortDesc: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
  includeArchived: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
})
export type TankListQuery = z.infer<typeof tankListQuerySchema>

export interface PublicTank {
  id: number
  name: string
  siteId: number
  siteName: string
  clientId: number | null
  clientName: string | null
  kind: TankKind
  stage: TankStage
  dimensions: TankShapeInput | null
  volumeLitres: number
  volumeSource: 'dimensions' | 'entered'
  substrateDepthCm: number
  heater: z.infer<typeof heaterSchema> | null
  filter: string
  media: string
  lightSchedule: z.infer<typeof lightScheduleSchema> | null
  targets: Targets
  notes: string
  sortOrder: number
  archivedAt: string | null
  createdAt: string
  updatedAt: string
}

/** A row of the tanks list: the tank and its state, latest values and open incidents. */
export interface TankListItem extends PublicTank {
  status: TankStatus
}

/** How many copies of a tank to make at once. */
export const MAX_TANK_COPIES = 50
export const tankDuplicateSchema = z.object({
  count: z
    .number({ error: 'a whole number from 1 to 50' })
    .int('a whole number from 1 to 50')
    .min(1, 'at least 1')
    .max(MAX_TANK_COPIES, `at most ${MAX_TANK_COPIES}`),
})
export type TankDuplicateInput = z.infer<typeof tankDuplicateSchema>
