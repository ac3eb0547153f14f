import { z } from 'zod'
import { METRIC_KEYS, type MetricKey } from '../metrics/registry'
import { instantDateSchema } from './time'

export const READING_SOURCES = ['device', 'test_kit', 'import'] as const
export type ReadingSource = (typeof READING_SOURCES)[number]

export const SERIES_DEFAULT_HOURS = 24
export const SERIES_MAX_DAYS = 400
export const SERIES_VALUES = ['corrected', 'raw'] as const
export type SeriesValues = (typeof SERIES_VALUES)[number]
export const SERIES_POINTS = { min: 10, max: 5000, default: 500 } as const

const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS

export const seriesQuerySchema = z
  .object({
    metric: z.enum(METRIC_KEYS),
    from: instantDateSchema.optional(),
    to: instantDateSchema.optional(),
    points: z.coerce
      .number()
      .int('must be a whole number')
      .min(SERIES_POINTS.min, `at least ${SERIES_POINTS.min}`)
      .max(SERIES_POINTS.max, `at most ${SERIES_POINTS.max}`)
      .default(SERIES_POINTS.default),
    /** `raw`: what devices sent before their calibration corrected it (rolled-up hours keep the corrected values only). */
    values: z.enum(SERIES_VALUES).default('corrected'),
  })
  .transform(({ metric, from, to, points, values }) => {
    const end = to ?? new Date()
    const start = from ?? new Date(end.getTime() - SERIES_DEFAULT_HOURS * HOUR_MS)
    return { metric, from: start, to: end, points, values }
  })
  .refine((q) => q.from.getTime() < q.to.getTime(), { message: 'must be before to', path: ['from'] })
  .refine((q) => q.to.getTime() - q.from.getTime() <= SERIES_MAX_DAYS * DAY_MS, {
    message: `the range may span at most ${SERIES_MAX_DAYS} days`,
    path: ['from'],
  })
export type SeriesQuery = z.output<typeof seriesQuerySchema>

export const seriesBucketSchema = z.object({
  /** Start of the bucket, ISO 8601 UTC. */
  t: z.string(),
  min: z.number(),
  mean: z.number(),
  max: z.number(),
  count: z.number().int(),
})
export type SeriesBucket = z.infer<typeof seriesBucketSchema>

export const rawReadingSchema = z.object({
  t: z.string(),
  value: z.number(),
  source: z.enum(READING_SOURCES),
  /** A calibration corrected this reading (the other view of the series shows the other value). */
  calibrated: z.literal(true).optional(),
  /** One reading far from both neighbours, which agree: a spike the watch rules do not act on alone. */
  spike: z.literal(true).optional(),
})
export type RawReading = z.infer<typeof rawReadingSchema>

export const seriesResponseSchema = z.object({
  metric: z.enum(METRIC_KEYS),
  /** Canonical unit of the metric (shared/metrics/registry). */
  unit: z.string(),
  from: z.string(),
  to: z.string(),
  /** Width of each bucket in seconds; 0 means `raw` holds every reading and `points` is empty. */
  bucketSeconds: z.number().int().min(0),
  points: z.array(seriesBucketSchema),
  raw: z.array(rawReadingSchema),
})
export type SeriesResponse = z.infer<typeof seriesResponseSchema>

export const latestValueSchema = z.object({ value: z.number(), time: z.string(), source: z.enum(READING_SOURCES) })
export type LatestValue = z.infer<typeof latestValueSchema>

/** Newest reading per metric; a metric never measured on the tank is absent. */
export const latestResponseSchema = z.partialRecord(z.enum(METRIC_KEYS), latestValueSchema)
export type LatestResponse = Partial<Record<MetricKey, LatestValue>>

/** The wall display: newest readings of every tank shown, one entry per tank in the order asked. */
export const siteLatestSchema = z.array(z.object({ tankId: z.number().int().positive(), metrics: latestResponseSchema }))
export type SiteLatestResponse = Array<{ tankId: number; metrics: LatestResponse }>
