// The build timeline: dated steps from the day the tank is filled to its first stocking.
// Day 1 is the fill day. Every interval here is common practice among keepers, not a standard.
import { plainNumber } from '../plain-number'
import { addDays, formatLocalDate, parseLocalDate } from '../time/zoned'
import { daysBetween } from '../care/due'
import { AMMONIA_ZERO_MG_L, NITRITE_ZERO_MG_L } from '../care/cycling'
import { requireInRange, requirePositiveUpTo } from '../chemistry/validate'

/** common practice: move pH by at most 0.2 a day, testing daily. */
export const DEFAULT_MAX_PH_CHANGE_PER_DAY = 0.2
/** common practice: new plants need 2–3 weeks to root before heavy feeders or diggers go in. */
export const ROOTING_DAYS = { min: 14, max: 21 } as const
/** common practice: a new tank takes about four weeks to cycle. */
export const CYCLING_EXPECTED_DAYS = 28
/** common practice: zero ammonia and nitrite on two tests in a row ends the cycling tests. */
export const CONSECUTIVE_ZERO_TESTS = 2
/** common practice: two weeks between stocking stages lets the filter catch up with each addition. */
export const DEFAULT_SETTLE_DAYS = 14

export type BuildStepKey = 'conditioner' | 'heater_check' | 'ph' | 'plants' | 'cycling' | `stock_${number}`

export interface BuildStep {
  key: BuildStepKey
  title: string
  /** Build day the step starts on (1 = the fill day) and, for daily work, the last planned day. */
  day: number
  untilDay: number | null
  dueOn: string
  daily: boolean
}

export interface TimelineInput {
  filledOn: string
  setPointC: number
  ph: { start: number | null; min: number; max: number; maxChangePerDay?: number }
  plants: boolean
  stages: ReadonlyArray<{ label: string; settleDays?: number }>
}

export interface Timeline {
  steps: BuildStep[]
  /** The build day of the first stocking: "build day 9 of about 28". */
  aboutDays: number
}

const plain = (n: number) => plainNumber(n, 2)

/** Daily pH targets from `start` into the band, at most `maxPerDay` apart; empty when already inside. */
export function phSteps(start: number, band: { min: number; max: number }, maxPerDay = DEFAULT_MAX_PH_CHANGE_PER_DAY): number[] {
  requireInRange('ph.start', start, 0, 14)
  requirePositiveUpTo('maxChangePerDay', maxPerDay, 1)
  const target = start < band.min ? band.min : start > band.max ? band.max : start
  const distance = Math.abs(target - start)
  const days = Math.ceil(distance / maxPerDay - 1e-9)
  const direction = Math.sign(target - start)
  return Array.from({ length: days }, (_, i) => (i === days - 1 ? target : Number((start + direction * maxPerDay * (i + 1)).toFixed(2))))
}

/** The build day `today` falls on, both `YYYY-MM-DD` on the site's calendar. */
export function buildDay(filledOn: string, today: string): number {
  return daysBetween(parseLocalDate(filledOn), parseLocalDate(today)) + 1
}

export function buildTimeline(input: TimelineInput): Timeline {
  const filled = parseLocalDate(input.filledOn)
  const on = (day: number) => formatLocalDate(addDays(filled, day - 1))
  const step = (key: BuildStepKey, title: string, day: number, untilDay: number | null = null): BuildStep => ({
    key,
    title,
    day,
    untilDay,
    dueOn: on(day),
    daily: untilDay !== null,
  })
  const band = `${plain(input.ph.min)}–${plain(input.ph.max)}`
  const steps: BuildStep[] = [
    step('conditioner', 'Fill the tank and add conditioner at the label dose for the fill volume', 1),
    step('heater_check', `Heater on since the fill: check the tank holds ${plain(input.setPointC)} °C`, 2),
  ]
  const maxPerDay = input.ph.maxChangePerDay ?? DEFAULT_MAX_PH_CHANGE_PER_DAY
  const targets = input.ph.start === null ? [] : phSteps(input.ph.start, input.ph, maxPerDay)
  if (targets.length) {
    steps.push(
      step(
        'ph',
        `Bring pH from ${plain(input.ph.start as number)} to ${band}, at most ${plain(maxPerDay)} a day, testing daily (${targets.map(plain).join(' → ')})`,
        2,
        1 + targets.length,
      ),
    )
  } else {
    steps.push(step('ph', `Test pH against the target ${band}`, 2))
  }
  let earliestStock = CYCLING_EXPECTED_DAYS
  if (input.plants) {
    steps.push(step('plants', `Plant; remove melting leaves; let plants root ${ROOTING_DAYS.min}–${ROOTING_DAYS.max} days before heavy feeders or diggers`, 3))
    earliestStock = Math.max(earliestStock, 3 + ROOTING_DAYS.max)
  }
  steps.push(
    step(
      'cycling',
      `Cycling tests: ammonia, nitrite and nitrate until ammonia and nitrite read zero on ${CONSECUTIVE_ZERO_TESTS} tests in a row`,
      3,
      earliestStock - 1,
    ),
  )
  let day = earliestStock
  input.stages.forEach((stage, i) => {
    if (i > 0) day += input.stages[i - 1]?.settleDays ?? DEFAULT_SETTLE_DAYS
    steps.push(step(`stock_${i + 1}`, `Stocking stage ${i + 1}: ${stage.label}, with acclimation`, day))
  })
  return { steps, aboutDays: earliestStock }
}

export interface NitrogenTest {
  at: number
  ammonia?: number
  nitrite?: number
}

/**
 * True when the last CONSECUTIVE_ZERO_TESTS tests that measured both ammonia and nitrite read
 * zero as a kit can tell it (shared/care/cycling's thresholds).
 */
export function zeroOnConsecutiveTests(tests: readonly NitrogenTest[], count = CONSECUTIVE_ZERO_TESTS): boolean {
  const both = tests.filter((t) => t.ammonia !== undefined && t.nitrite !== undefined).sort((a, b) => a.at - b.at)
  const last = both.slice(-count)
  return last.length === count && last.every((t) => (t.ammonia as number) <= AMMONIA_ZERO_MG_L && (t.nitrite as number) <= NITRITE_ZERO_MG_L)
}

export type TimelineEvent = { kind: 'cycled'; day: number } | { kind: 'stocked'; stage: number; day: number }

/**
 * The stocking stages' build days re-dated from what happened. Cycling that ends on `day` puts
 * the first stage no earlier than the next day, and every later stage moves with it. A stage
 * stocked on `day` dates each later stage from it, its settle days apart (`settleDays[i]` is
 * the wait after stage i + 1).
 */
export function redateStocking(plannedDays: readonly number[], settleDays: readonly number[], event: TimelineEvent): number[] {
  const days = [...plannedDays]
  if (!days.length) return days
  if (event.kind === 'cycled') {
    const shift = Math.max(0, event.day + 1 - (days[0] as number))
    return days.map((d) => d + shift)
  }
  days[event.stage - 1] = event.day
  for (let i = event.stage; i < days.length; i++) days[i] = (days[i - 1] as number) + (settleDays[i - 1] ?? DEFAULT_SETTLE_DAYS)
  return days
}
