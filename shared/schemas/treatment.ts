import { z } from 'zod'
import { DOSE_UNITS, type CourseState, type CourseTest, type LabelDose } from '../care/treatment'
import { METRIC_KEYS } from '../metrics/registry'
import { localDateSchema } from './time'

/** Most labels run a course for days to a few weeks; a longer one is a standing routine, not a course. */
export const MAX_COURSE_DAYS = 90

export const labelDoseSchema = z.object({
  amount: z.number().positive('must be above zero').max(10000),
  unit: z.enum(DOSE_UNITS),
  perLitres: z.number().positive('must be above zero').max(10000),
})

export const courseTestSchema = z.object({
  metric: z.enum(METRIC_KEYS),
  timesPerDay: z.number().int().min(1, 'at least once a day').max(4, 'at most 4 times a day'),
  band: z
    .object({ min: z.number().min(0), max: z.number().min(0) })
    .refine((b) => b.min <= b.max, { message: 'min must not exceed max', path: ['max'] })
    .nullable()
    .default(null),
})

export const treatmentCourseInputSchema = z
  .object({
    product: z.string().trim().min(1, 'name the product as its label does').max(200),
    dose: labelDoseSchema,
    days: z.number().int().min(1, 'at least one day').max(MAX_COURSE_DAYS, `at most ${MAX_COURSE_DAYS} days`),
    doseEveryDays: z.number().int().min(1).max(MAX_COURSE_DAYS).default(1),
    /** The first day on the site's calendar; today when left out. */
    startsOn: localDateSchema.optional(),
    tests: z
      .array(courseTestSchema)
      .max(5, 'at most 5 tests')
      .refine((ts) => new Set(ts.map((t) => t.metric)).size === ts.length, 'each test once')
      .default([]),
    notes: z.string().trim().max(2000).default(''),
  })
  .refine((c) => c.doseEveryDays <= c.days, { message: 'cannot be longer than the course', path: ['doseEveryDays'] })
export type TreatmentCourseInput = z.infer<typeof treatmentCourseInputSchema>
export type TreatmentCourseBody = z.input<typeof treatmentCourseInputSchema>

export interface PublicTreatmentCourse {
  id: number
  tankId: number
  product: string
  dose: LabelDose
  /** The label dose for this tank's water at the time the course started. */
  tankDose: { amount: number; unit: LabelDose['unit']; waterLitres: number }
  days: number
  doseEveryDays: number
  startsOn: string
  endsOn: string
  tests: CourseTest[]
  notes: string
  state: CourseState
  /** Day of the course today (1-based) while it runs. */
  day: number | null
  stoppedAt: string | null
  createdBy: { id: number; name: string } | null
  createdAt: string
  careTaskIds: number[]
  cautions: string[]
}

/** A running course as the water-change planner and Care today see it. */
export interface RunningCourse {
  id: number
  product: string
  endsOn: string
}
