import { z } from 'zod'
import { instantSchema } from './time'

/** Metrics a probe calibration exists for. */
export const CALIBRATED_METRICS = ['ph', 'temperature', 'conductivity'] as const
export type CalibratedMetric = (typeof CALIBRATED_METRICS)[number]

const finite = z.number().finite()
const bufferPointSchema = z
  .object({
    buffer: finite.min(0).max(14),
    temperatureC: finite.min(0).max(60),
    reading: finite.min(0).max(14).optional(),
    millivolts: finite.min(-1000).max(1000).optional(),
  })
  .refine((p) => (p.reading === undefined) !== (p.millivolts === undefined), { message: 'give the probe reading or its millivolts', path: ['reading'] })

const common = {
  performedAt: instantSchema.optional(),
  notes: z.string().trim().max(2000).default(''),
}

export const calibrationInputSchema = z.discriminatedUnion('metric', [
  z.object({
    metric: z.literal('ph'),
    ...common,
    points: z
      .array(bufferPointSchema)
      .min(2, 'two or three buffers')
      .max(3, 'two or three buffers')
      .refine((ps) => new Set(ps.map((p) => p.buffer)).size === ps.length, { message: 'each buffer once' }),
  }),
  z.object({ metric: z.literal('temperature'), ...common, referenceC: finite.min(-5).max(60), reading: finite.min(-5).max(60) }),
  z.object({ metric: z.literal('conductivity'), ...common, standard: finite.positive().max(200_000), reading: finite.positive().max(200_000) }),
])
export type CalibrationInput = z.output<typeof calibrationInputSchema>
export type CalibrationBody = z.input<typeof calibrationInputSchema>

export interface PublicCalibration {
  id: number
  deviceId: number
  metric: CalibratedMetric
  method: 'ph_buffers' | 'offset' | 'factor'
  /** What was entered: the buffers, or the reference and the probe's reading. */
  points: unknown
  /** corrected = intercept + gain · raw */
  gain: number
  intercept: number
  slopePercent: number | null
  offsetMv: number | null
  /** pH only: the slope is inside the usual range; false means clean or replace the probe. */
  slopeOk: boolean | null
  performedAt: string
  performedBy: { id: number; name: string } | null
  notes: string
}
