// Treatment courses: what a course's label dose comes to for a tank, which days it runs, what a
// water change does to it, and the tasks it puts in Care today. The dose and the days are always
// the product label's; nothing here suggests a medication or an amount of its own.
import { waterVolumeLitres, type TankShape } from '../chemistry/volume'
import { METRICS, type MetricKey } from '../metrics/registry'
import { formatValue } from '../metrics/units'
import { addDays, formatLocalDate, parseLocalDate } from '../time/zoned'
import { daysBetween } from './due'
import type { CareTaskDraft } from './defaults'

export const DOSE_UNITS = ['mL', 'drops', 'g', 'mg', 'tablets'] as const
export type DoseUnit = (typeof DOSE_UNITS)[number]

/** The label's rate: `amount` of product per `perLitres` litres of water. */
export interface LabelDose {
  amount: number
  unit: DoseUnit
  perLitres: number
}

export interface CourseTest {
  metric: MetricKey
  timesPerDay: number
  /** The label's band for the test, canonical units; null when the label gives none. */
  band: { min: number; max: number } | null
}

/** Said on the course screen and in its dialog, every time. */
export const COURSE_CAUTIONS = [
  'Follow the product label: its dose, its days and its warnings come first; the figures here only scale the label rate to this tank',
  'Many treatments harm invertebrates and plants, and some harm the filter bacteria: check the label before treating a tank that holds them',
  'Keep medications and test chemicals away from food and out of reach of children; wear gloves where the label says so',
  'Ask an aquatic veterinarian before treating, and when fish do not improve or get worse',
]

/** Activated carbon and similar media take most medications out of the water. */
export const CARBON_NOTE = 'Activated carbon removes most medications: leave carbon out of the filter while the course runs, unless the label says otherwise'

/** common practice: with no level reading, a tank is taken to be filled to 90 % of its height (as the water-change planner does). */
export const ASSUMED_FILL_FRACTION = 0.9

/** The water a label dose is for: from the inside dimensions less the substrate, else the entered volume. */
export function doseWaterLitres(tank: { dimensions: TankShape | null; substrateDepthCm: number; volumeLitres: number }): number {
  const shape = tank.dimensions
  return shape ? waterVolumeLitres(shape, shape.heightCm * ASSUMED_FILL_FRACTION, tank.substrateDepthCm) : tank.volumeLitres
}

/** The label's dose scaled to the tank's water. */
export function doseForTank(dose: LabelDose, waterLitres: number): number {
  if (!(dose.amount > 0) || !(dose.perLitres > 0) || !(waterLitres > 0)) throw new RangeError('dose and water volume must be above zero')
  return (dose.amount * waterLitres) / dose.perLitres
}

/** The last day of a course of `days` days starting on `startsOn` (both `YYYY-MM-DD`, site calendar). */
export function courseEndsOn(startsOn: string, days: number): string {
  return formatLocalDate(addDays(parseLocalDate(startsOn), days - 1))
}

export type CourseState = 'planned' | 'running' | 'finished' | 'stopped'

/** Where a course stands on the site's `today`, and which day of it today is (1-based) while it runs. */
export function courseState(course: { startsOn: string; endsOn: string; stoppedAt: string | null }, today: string): { state: CourseState; day: number | null } {
  if (course.stoppedAt) return { state: 'stopped', day: null }
  const day = daysBetween(parseLocalDate(course.startsOn), parseLocalDate(today)) + 1
  if (day < 1) return { state: 'planned', day: null }
  if (today > course.endsOn) return { state: 'finished', day: null }
  return { state: 'running', day }
}

/**
 * A partial water change with complete mixing (mass balance): the medication left is the water kept,
 * C_after = C_before × (V − v) / V. Returns the fraction of the dose left, 0–1.
 */
export function fractionLeftAfterWaterChange(waterLitres: number, litresOut: number): number {
  if (!(waterLitres > 0) || litresOut < 0 || litresOut > waterLitres) throw new RangeError('litresOut must be between 0 and the water volume')
  return (waterLitres - litresOut) / waterLitres
}

const TIMES_OF_DAY: Record<number, string[]> = {
  1: [''],
  2: ['morning', 'evening'],
  3: ['morning', 'midday', 'evening'],
  4: ['morning', 'midday', 'afternoon', 'evening'],
}

function bandText(test: CourseTest): string {
  if (!test.band) return ''
  const def = METRICS[test.metric]
  const unit = def.unitLabel === 'pH' ? '' : ` ${def.unitLabel}`
  return `, label band ${formatValue(test.metric, test.band.min)}–${formatValue(test.metric, test.band.max)}${unit}`
}

function amountText(amount: number): string {
  return amount >= 10 ? amount.toFixed(0) : amount >= 1 ? amount.toFixed(1) : amount.toFixed(2)
}

/** The care tasks of a course: one dose task on its dose days, one test task per test and time of day, each every day. */
export function courseTaskDrafts(course: {
  product: string
  dose: LabelDose
  doseEveryDays: number
  tests: CourseTest[]
  waterLitres: number
}): Array<CareTaskDraft & { role: 'dose' | 'test' }> {
  const amount = doseForTank(course.dose, course.waterLitres)
  const product = course.product.length > 60 ? `${course.product.slice(0, 59)}…` : course.product
  const drafts: Array<CareTaskDraft & { role: 'dose' | 'test' }> = [
    {
      role: 'dose',
      kind: 'treatment_dose',
      title: `Dose ${product}: ${amountText(amount)} ${course.dose.unit} for ${Math.round(course.waterLitres)} L, as the label says`,
      recurrence: { kind: 'interval', everyDays: course.doseEveryDays },
      defaultValues: { product: course.product, amount: Number(amount.toFixed(3)), unit: course.dose.unit },
    },
  ]
  for (const test of course.tests) {
    for (const time of TIMES_OF_DAY[test.timesPerDay] ?? ['']) {
      drafts.push({
        role: 'test',
        kind: 'treatment_test',
        title: `Test ${METRICS[test.metric].label.toLowerCase()}${time ? ` (${time})` : ''} during ${product}${bandText(test)}`,
        recurrence: { kind: 'interval', everyDays: 1 },
        defaultValues: { metric: test.metric, ...(test.band ? { min: test.band.min, max: test.band.max } : {}) },
      })
    }
  }
  return drafts
}

/**
 * What a running course means for another care task: carbon in the filter takes the medication out,
 * a water change dilutes it. Null when the task does not touch the course.
 */
export function courseNoteFor(
  task: { kind: string; title: string; defaultValues: Record<string, unknown> },
  courses: Array<{ product: string; endsOn: string }>,
): string | null {
  const course = courses[0]
  if (!course) return null
  if (task.kind === 'media_replace' || /carbon/i.test(task.title)) return `${CARBON_NOTE} (${course.product} runs until ${course.endsOn}).`
  if (task.kind === 'water_change') {
    const percent = typeof task.defaultValues.percent === 'number' ? task.defaultValues.percent : null
    const left = percent != null ? ` this ${percent} % change leaves ${100 - percent} % of it in the water;` : ''
    return `A water change dilutes ${course.product}:${left} follow the label on whether to dose the new water.`
  }
  return null
}
