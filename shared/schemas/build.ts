import { z } from 'zod'
import { clockTimeSchema, idSchema } from './common'
import { SPECIES_KEYS } from '../care/species'
import { DEFAULT_MEDIA_ORDER, TROPICAL_SET_POINT_C } from '../build/equipment'
import { DEFAULT_MAX_PH_CHANGE_PER_DAY, DEFAULT_SETTLE_DAYS } from '../build/timeline'
import { parseLocalDate } from '../time/zoned'
import { targetBandSchema, type PublicTank } from './tanks'

const localDate = z.string().refine((s) => {
  try {
    parseLocalDate(s)
    return true
  } catch {
    return false
  }
}, 'use a calendar date YYYY-MM-DD')
const isoInstant = z.iso.datetime({ offset: true })
const label = (max: number) => z.string().trim().max(max)

export const labelRateSchema = z.object({
  amount: z.number().positive('must be above zero').max(1000),
  unit: z.enum(['mL', 'drops', 'g']),
  per: z.enum(['L', '10L']),
})

export const substrateLayerSchema = z.object({
  material: z.string().trim().min(1, 'required').max(60),
  depthCm: z.number().positive('must be above zero').max(30),
  densityKgPerL: z.number().positive('must be above zero').max(5).optional(),
  bagLitres: z.number().positive('must be above zero').max(100).optional(),
})

export const hardscapeItemSchema = z
  .object({
    kind: z.enum(['rock', 'wood']),
    label: label(80).default(''),
    kg: z.number().positive('must be above zero').max(500).optional(),
    litres: z.number().positive('must be above zero').max(300).optional(),
  })
  .refine((h) => h.kg !== undefined || h.litres !== undefined, { message: 'give the weight or the volume', path: ['kg'] })

export const stockingStageSchema = z.object({
  label: label(120).default(''),
  settleDays: z.number().int().min(1).max(90).default(DEFAULT_SETTLE_DAYS),
  groups: z
    .array(z.object({ speciesKey: z.string().refine((k) => SPECIES_KEYS.includes(k), 'unknown species'), count: z.number().int().min(1).max(1000) }))
    .min(1, 'at least one species')
    .max(20),
})

export const buildPlanSchema = z.object({
  fillHeightCm: z.number().positive('must be above zero').max(300),
  glassThicknessMm: z.number().positive('must be above zero').max(40).default(6),
  roomC: z.number().min(0).max(40).default(20),
  filter: z.object({
    name: label(200).default(''),
    /** In the order the water passes them; the keeper sets it. */
    media: z
      .array(z.string().trim().min(1).max(60))
      .max(10)
      .default([...DEFAULT_MEDIA_ORDER]),
  }),
  heater: z.object({
    /** null: take the suggested rating. */
    watts: z.number().positive().max(5000).nullable().default(null),
    setPointC: z.number().min(5).max(35).default(TROPICAL_SET_POINT_C.min),
    topCm: z.number().min(0).max(300).nullable().default(null),
  }),
  light: z.object({ on: clockTimeSchema, off: clockTimeSchema }).nullable().default(null),
  substrate: z.array(substrateLayerSchema).max(6).default([]),
  hardscape: z.array(hardscapeItemSchema).max(30).default([]),
  water: z.object({
    conditioner: label(120).default(''),
    labelRate: labelRateSchema.nullable().default(null),
    startPh: z.number().min(3).max(11).nullable().default(null),
    maxPhChangePerDay: z.number().positive().max(1).default(DEFAULT_MAX_PH_CHANGE_PER_DAY),
    temperature: targetBandSchema.nullable().default(null),
    ph: targetBandSchema.nullable().default(null),
  }),
  plants: z.boolean().default(false),
  stocking: z.array(stockingStageSchema).max(8).default([]),
  notes: label(4000).default(''),
})
export type BuildPlan = z.infer<typeof buildPlanSchema>
export type BuildPlanInput = z.input<typeof buildPlanSchema>

export const buildStartSchema = z.object({ filledOn: localDate })
export type BuildStartInput = z.infer<typeof buildStartSchema>
export const buildStepDoneSchema = z.object({
  at: isoInstant.optional(),
  notes: label(2000).default(''),
  /** A stocking stage adds its groups as livestock, each with the acclimation plan for this bag. */
  acclimation: z
    .object({
      bagLitres: z.number().positive('must be above zero').max(200),
      bagTempC: z.number().min(0).max(40).optional(),
      bagPh: z.number().min(3).max(11).optional(),
      intervalMinutes: z.number().min(5).max(10).optional(),
    })
    .optional(),
})
export type BuildStepDoneInput = z.infer<typeof buildStepDoneSchema>
/** The body as a client sends it, before the defaults are filled in. */
export type BuildStepDoneBody = z.input<typeof buildStepDoneSchema>
export const buildStepParamsSchema = z.object({
  id: idSchema,
  key: z.string().regex(/^(conditioner|heater_check|ph|plants|cycling|stock_[1-8])$/, 'unknown step'),
})
export const buildReportMailSchema = z.object({ emails: z.array(z.email().max(320)).min(1, 'at least one address').max(10) })

export interface PublicBuildStep {
  key: string
  title: string
  day: number
  untilDay: number | null
  dueOn: string
  daily: boolean
  doneAt: string | null
  doneBy: number | null
  careTaskId: number | null
  notes: string
}

export interface PublicBuild {
  tankId: number
  plan: BuildPlan
  filledOn: string | null
  /** Today's build day (1 = the fill day) on the site's calendar; null before filling. */
  day: number | null
  aboutDays: number | null
  finishedAt: string | null
  steps: PublicBuildStep[]
  cycled: boolean
  updatedAt: string
}

/** A first plan for a tank: filled 2 cm below the rim, the tank's own heater and targets if it has them. */
export function defaultBuildPlan(tank: Pick<PublicTank, 'dimensions' | 'heater' | 'lightSchedule' | 'targets' | 'kind'>): BuildPlanInput {
  const height = tank.dimensions?.heightCm ?? 40
  return {
    fillHeightCm: Math.max(1, height - 2),
    filter: { name: '', media: [...DEFAULT_MEDIA_ORDER] },
    heater: { watts: tank.heater?.watts ?? null, setPointC: tank.heater?.setPointC ?? TROPICAL_SET_POINT_C.min, topCm: tank.heater?.topCm ?? null },
    // common practice: a new tank starts on about 8 hours of light, which keeps early algae down.
    light: tank.lightSchedule ?? { on: '10:00', off: '18:00' },
    substrate: [],
    hardscape: [],
    water: { temperature: tank.targets.temperature ?? null, ph: tank.targets.ph ?? null },
    plants: tank.kind === 'planted',
    stocking: [],
  }
}

export interface BuildTemplate {
  tankId: number
  tankName: string
  finishedAt: string
  plan: BuildPlan
}
