// Acclimating new arrivals: small additions of tank water to the bag or container at regular
// intervals (common practice: every 5–10 minutes over about half an hour), with an estimate
// of where the container's temperature and pH stand after each addition.

/** common practice: every 5–10 minutes; 30 minutes in all. */
export const ACCLIMATION_TOTAL_MINUTES = 30
export const ACCLIMATION_INTERVAL_RANGE = { min: 5, max: 10 } as const
export const DEFAULT_INTERVAL_MINUTES = 5
/** Our default: the tank water added over the whole half hour roughly equals the bag's own volume. */
const ADDED_OVER_PLAN_PER_BAG_LITRE = 1

export const MIXING_NOTE =
  'Estimates assume simple mixing: temperature weighted by volume, pH by averaging hydrogen-ion concentrations. ' +
  'Buffering (KH) and the bag warming while it floats are ignored, so pH is a rough guide only: check with a test kit.'

export interface AcclimationInput {
  /** Unknown: the plan then gives each addition only as a share of the bag's volume. */
  bagLitres?: number
  bagTempC?: number
  bagPh?: number
  tankTempC?: number
  tankPh?: number
  intervalMinutes?: number
}

export interface AcclimationStep {
  minute: number
  /** Share of the bag's starting volume to add at this step. */
  addFractionOfBag: number
  addLitres: number | null
  totalLitres: number | null
  /** null when the bag's or the tank's figure is unknown. */
  estimatedTempC: number | null
  estimatedPh: number | null
}

export interface AcclimationPlan {
  intervalMinutes: number
  steps: AcclimationStep[]
  /** When the animals are netted across: one interval after the last addition. */
  netAtMinute: number
  note: string
  cautions: string[]
}

export const ACCLIMATION_CAUTIONS = ['Net the animals across; do not pour bag water into the tank', 'Keep the tank lights dimmed for the first hours']

function requirePositive(name: string, value: number) {
  if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be above zero (got ${value})`)
}

/** Volume-weighted mean: the heat balance for two lots of water of equal specific heat. */
export function mixTemperature(litresA: number, tempA: number, litresB: number, tempB: number): number {
  requirePositive('litres', litresA + litresB)
  return (litresA * tempA + litresB * tempB) / (litresA + litresB)
}

/** pH of a mix by averaging [H⁺] = 10^−pH by volume; ignores buffering, so a rough guide. */
export function mixPh(litresA: number, phA: number, litresB: number, phB: number): number {
  requirePositive('litres', litresA + litresB)
  const hydrogen = (litresA * 10 ** -phA + litresB * 10 ** -phB) / (litresA + litresB)
  return -Math.log10(hydrogen)
}

export function acclimationPlan(input: AcclimationInput): AcclimationPlan {
  if (input.bagLitres !== undefined) requirePositive('bagLitres', input.bagLitres)
  const intervalMinutes = input.intervalMinutes ?? DEFAULT_INTERVAL_MINUTES
  if (intervalMinutes < ACCLIMATION_INTERVAL_RANGE.min || intervalMinutes > ACCLIMATION_INTERVAL_RANGE.max) {
    throw new RangeError(`intervalMinutes must be 5 to 10 (got ${intervalMinutes})`)
  }
  const count = Math.max(1, Math.floor(ACCLIMATION_TOTAL_MINUTES / intervalMinutes))
  const fraction = ADDED_OVER_PLAN_PER_BAG_LITRE / count
  const bag = input.bagLitres
  // Each addition is a share of the bag, so the mix (and every estimate) does not depend on
  // the bag's actual volume: an unknown bag is mixed as one unit.
  const knowsTemp = input.bagTempC !== undefined && input.tankTempC !== undefined
  const knowsPh = input.bagPh !== undefined && input.tankPh !== undefined
  const start = bag ?? 1
  const addLitres = start * fraction
  let litres = start
  let temp = input.bagTempC
  let ph = input.bagPh
  const steps: AcclimationStep[] = []
  for (let i = 1; i <= count; i++) {
    if (knowsTemp) temp = mixTemperature(litres, temp as number, addLitres, input.tankTempC as number)
    if (knowsPh) ph = mixPh(litres, ph as number, addLitres, input.tankPh as number)
    litres += addLitres
    steps.push({
      minute: (i - 1) * intervalMinutes,
      addFractionOfBag: fraction,
      addLitres: bag === undefined ? null : addLitres,
      totalLitres: bag === undefined ? null : litres,
      estimatedTempC: knowsTemp ? (temp as number) : null,
      estimatedPh: knowsPh ? (ph as number) : null,
    })
  }
  return { intervalMinutes, steps, netAtMinute: count * intervalMinutes, note: MIXING_NOTE, cautions: ACCLIMATION_CAUTIONS }
}
