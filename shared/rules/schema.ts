import { z } from 'zod'
import { METRIC_KEYS } from '../metrics/registry'

// A week bounds every duration: longer holds or windows would need more history than the
// engine keeps in memory for one rule.
const MAX_MINUTES = 7 * 24 * 60

const metricSchema = z.enum(METRIC_KEYS)
const finite = z.number().finite()
const holdMinutesSchema = z.number().min(0).max(MAX_MINUTES)
const marginSchema = z.number().min(0).max(1000)

/** What a missing reading means to a rule: keep its last state, count as tripped, or count as clear. */
export const MISSING_READING_CHOICES = ['keep', 'tripped', 'clear'] as const
export type MissingReading = (typeof MISSING_READING_CHOICES)[number]
/** A rule's settle window when it names none: a trip this soon after a clear is a flap (`common practice`). */
export const DEFAULT_SETTLE_MINUTES = 30
/** How long without a reading counts as missing (the starter quiet rule's period). */
export const MISSING_AFTER_MINUTES = 15

// Shared by every kind. Optional rather than defaulted, so rules stored before they existed read the same.
const commonFields = {
  /** A trip this many minutes after a clear reopens the same incident (a flap). */
  settleMinutes: z
    .number()
    .int()
    .min(0)
    .max(24 * 60)
    .optional(),
  missingReading: z.enum(MISSING_READING_CHOICES).optional(),
}

export const ruleSeveritySchema = z.enum(['warning', 'alarm'])
export type RuleSeverity = z.infer<typeof ruleSeveritySchema>

export const aboveSpecSchema = z.object({
  kind: z.literal('above'),
  ...commonFields,
  metric: metricSchema,
  limit: finite,
  holdMinutes: holdMinutesSchema.default(0),
  clearMargin: marginSchema.default(0),
})

export const belowSpecSchema = z.object({
  kind: z.literal('below'),
  ...commonFields,
  metric: metricSchema,
  limit: finite,
  holdMinutes: holdMinutesSchema.default(0),
  clearMargin: marginSchema.default(0),
})

export const outsideSpecSchema = z
  .object({
    kind: z.literal('outside'),
    ...commonFields,
    metric: metricSchema,
    min: finite,
    max: finite,
    holdMinutes: holdMinutesSchema.default(0),
    clearMargin: marginSchema.default(0),
  })
  // A clear band that is empty would leave an incident open for ever.
  .refine((spec) => spec.max - spec.min > 2 * spec.clearMargin, {
    message: 'max must exceed min by more than twice the clear margin',
    path: ['max'],
  })

export const rateSpecSchema = z.object({
  kind: z.literal('rate'),
  ...commonFields,
  metric: metricSchema,
  maxChange: z.number().positive().finite(),
  windowMinutes: z.number().positive().max(MAX_MINUTES),
})

export const quietSpecSchema = z.object({
  kind: z.literal('quiet'),
  ...commonFields,
  metric: metricSchema,
  quietMinutes: z.number().positive().max(MAX_MINUTES),
})

export const heaterLineSpecSchema = z.object({
  kind: z.literal('heater_line'),
  ...commonFields,
  marginCm: marginSchema,
  holdMinutes: holdMinutesSchema.default(0),
  clearMargin: marginSchema.default(0.5),
})

export const lightScheduleSpecSchema = z.object({
  kind: z.literal('light_schedule'),
  ...commonFields,
  holdMinutes: holdMinutesSchema,
  onLux: z.number().positive().finite().default(50),
})

/** A test-kit value differs from the probe's at that time by more than the larger of `tolerance` and `tolerancePercent` of the kit value. */
export const probeKitSpecSchema = z.object({
  kind: z.literal('probe_kit'),
  ...commonFields,
  metric: metricSchema,
  tolerance: z.number().min(0).finite(),
  tolerancePercent: z.number().min(0).max(100).default(0),
  withinMinutes: z
    .number()
    .positive()
    .max(24 * 60)
    .default(15),
})

/** A probe whose readings stay within `noiseFloor` for `flatMinutes` after it has been seen to move. */
export const stuckSpecSchema = z.object({
  kind: z.literal('stuck'),
  ...commonFields,
  metric: metricSchema,
  flatMinutes: z.number().positive().max(MAX_MINUTES),
  noiseFloor: z.number().min(0).finite(),
})

export const watchRuleSpecSchema = z.discriminatedUnion('kind', [
  aboveSpecSchema,
  belowSpecSchema,
  outsideSpecSchema,
  rateSpecSchema,
  quietSpecSchema,
  heaterLineSpecSchema,
  lightScheduleSpecSchema,
  probeKitSpecSchema,
  stuckSpecSchema,
])

/** A parsed spec: every default filled in. This is what the evaluator takes. */
export type WatchRuleSpec = z.output<typeof watchRuleSpecSchema>
/** What an API client may send: defaulted fields may be left out. */
export type WatchRuleSpecInput = z.input<typeof watchRuleSpecSchema>
export type WatchRuleKind = WatchRuleSpec['kind']
export type SpecOfKind<K extends WatchRuleKind> = Extract<WatchRuleSpec, { kind: K }>

export const watchRuleDraftSchema = z.object({
  name: z.string().trim().min(1).max(120),
  severity: ruleSeveritySchema,
  spec: watchRuleSpecSchema,
})
export type WatchRuleDraft = z.output<typeof watchRuleDraftSchema>
