// What a keeper should hear before animals move into another tank: trouble open on the target
// tank, and water far enough from the batch's own that acclimation needs time.
import { acclimationPlan } from '../care/acclimation'

/** common practice: a pH gap above half a unit calls for a slow acclimation rather than a quick swap. */
export const PH_GAP_WARN = 0.5
/** common practice: more than about 2 °C between two tanks stresses fish moved straight across. */
export const TEMPERATURE_GAP_WARN_C = 2

export type MoveWarningCode = 'open_incident' | 'ph_gap' | 'temperature_gap' | 'tank_cycling' | 'tank_empty' | 'same_tank'

export interface MoveWarning {
  code: MoveWarningCode
  message: string
}

export interface MoveCheckInput {
  targetName: string
  targetStage: string
  openIncidents: ReadonlyArray<{ title: string }>
  /** The batch's tank now and the target tank; undefined when unknown. */
  from: { ph?: number; tempC?: number }
  to: { ph?: number; tempC?: number }
}

const fixed = (n: number, digits: number) => n.toFixed(digits)

/** Warnings in the order they matter: open trouble first, then the water. */
export function moveWarnings(input: MoveCheckInput): MoveWarning[] {
  const warnings: MoveWarning[] = []
  const target = input.targetName
  for (const incident of input.openIncidents) {
    warnings.push({ code: 'open_incident', message: `${target} has an open incident: ${incident.title}` })
  }
  if (input.targetStage === 'empty') warnings.push({ code: 'tank_empty', message: `${target} is marked empty` })
  if (input.targetStage === 'cycling') {
    warnings.push({ code: 'tank_cycling', message: `${target} is still cycling: ammonia and nitrite can harm animals until it is cycled` })
  }
  const { from, to } = input
  if (from.ph !== undefined && to.ph !== undefined && Math.abs(from.ph - to.ph) > PH_GAP_WARN) {
    // The acclimation plan's own estimate: where the container stands when the animals are netted across.
    const plan = acclimationPlan({ bagPh: from.ph, tankPh: to.ph })
    const netted = plan.steps.at(-1)?.estimatedPh ?? to.ph
    warnings.push({
      code: 'ph_gap',
      message:
        `pH ${fixed(from.ph, 1)} here, ${fixed(to.ph, 1)} in ${target} (${fixed(Math.abs(from.ph - to.ph), 1)} apart): ` +
        `acclimate over ${plan.netAtMinute} minutes; the container reads about pH ${fixed(netted, 1)} when the animals are netted across`,
    })
  }
  if (from.tempC !== undefined && to.tempC !== undefined && Math.abs(from.tempC - to.tempC) > TEMPERATURE_GAP_WARN_C) {
    warnings.push({
      code: 'temperature_gap',
      message: `${fixed(from.tempC, 1)} °C here, ${fixed(to.tempC, 1)} °C in ${target}: float the container until the two are close`,
    })
  }
  return warnings
}
