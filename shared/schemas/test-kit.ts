import type { MetricKey } from '../metrics/registry'
import { z } from 'zod'
import { METRIC_KEYS } from '../metrics/registry'
import { clientIdSchema } from './common'
import { instantSchema } from './time'

/** A keeper's test-kit entry: any kit metrics, each in the unit the kit reports. */
export const kitValueSchema = z.object({
  metric: z.enum(METRIC_KEYS),
  value: z.number({ error: 'enter a number' }).finite(),
  unit: z.string().min(1).max(20),
})
export type KitValue = z.infer<typeof kitValueSchema>

export const testKitEntryInputSchema = z.object({
  takenAt: instantSchema.optional(),
  values: z
    .array(kitValueSchema)
    .min(1, 'enter at least one value')
    .max(METRIC_KEYS.length)
    .refine((vs) => new Set(vs.map((v) => v.metric)).size === vs.length, 'each metric once'),
  notes: z.string().trim().max(2000).default(''),
  /** Kept on create only: an edit never changes it. */
  clientId: clientIdSchema.optional(),
})
export type TestKitEntryInput = z.infer<typeof testKitEntryInputSchema>

/** How long the keeper who made an entry may still edit or delete it. */
export const TEST_KIT_EDIT_WINDOW_HOURS = 24

export interface PublicTestKitEntry {
  id: number
  tankId: number
  takenAt: string
  values: KitValue[]
  notes: string
  enteredBy: { id: number; name: string }
  editableUntil: string
  revisions: number
  createdAt: string
  /** On the answer to a save only: each value a probe of the tank also measured, against the probe's reading then. */
  probeChecks?: ProbeCheck[]
}

/** A test-kit value against the tank's probe at that time: they disagree by more than `limit` (the tank's rule or the usual tolerance). */
export interface ProbeCheck {
  metric: MetricKey
  kit: number
  probe: number
  probeAt: string
  /** probe − kit */
  difference: number
  limit: number
  disagrees: boolean
}
