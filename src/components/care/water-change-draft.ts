import { toCanonical } from '@shared/metrics/units'
import { waterChangePlanSchema } from '@shared/schemas/care'
import type { LabelRate, WaterChangePlanBody, WaterChangePlanResult } from '@shared/schemas/care-api'
import { fieldErrors, friendlyIssues, type FieldErrors } from '@/composables/useFieldErrors'
import { displayUnitOf } from '@/composables/useUnits'
import { parseDecimal } from '@/components/testkit/kit-checks'

export interface WaterChangeDraft {
  mode: 'percent' | 'litres'
  amount: string
  labelAmount: string
  labelUnit: LabelRate['unit']
  labelPer: LabelRate['per']
  /** In the person's temperature unit. */
  newWaterTemp: string
}

export const freshWaterChangeDraft = (percent = 12): WaterChangeDraft => ({
  mode: 'percent',
  amount: String(percent),
  labelAmount: '',
  labelUnit: 'mL',
  labelPer: '10L',
  newWaterTemp: '',
})

const numberOrNaN = (text: string) => parseDecimal(text) ?? Number.NaN

/** A blank optional field is left out; a field with something unreadable in it is an error. */
export function planInputFromDraft(draft: WaterChangeDraft): { input: WaterChangePlanBody | null; errors: FieldErrors } {
  const errors: FieldErrors = {}
  const input: WaterChangePlanBody = draft.mode === 'percent' ? { percent: numberOrNaN(draft.amount) } : { litres: numberOrNaN(draft.amount) }
  if (draft.labelAmount.trim()) input.labelRate = { amount: numberOrNaN(draft.labelAmount), unit: draft.labelUnit, per: draft.labelPer }
  if (draft.newWaterTemp.trim()) {
    const value = parseDecimal(draft.newWaterTemp)
    const converted = value === null ? null : toCanonical('temperature', value, displayUnitOf('temperature'))
    if (converted?.ok) input.newWaterTempC = Number(converted.value.toFixed(2))
    else errors.newWaterTempC = 'enter a number'
  }
  const checked = waterChangePlanSchema.safeParse(input, { error: friendlyIssues })
  if (!checked.success) Object.assign(errors, fieldErrors(checked.error))
  // The amount field is shared by both modes, so its message is shown whichever one failed.
  if (errors.litres && !errors.percent) errors.percent = errors.litres
  return { input: Object.keys(errors).length ? null : input, errors }
}

/**
 * The server's rule: the heater must be confirmed off when the change uncovers it or exceeds
 * the threshold it states. Checked here too, so the dialog never depends on one flag alone.
 */
export function needsHeaterConfirmation(plan: WaterChangePlanResult): boolean {
  return plan.requiresHeaterOffConfirmation || plan.heaterExposed || plan.percent > plan.heaterConfirmAbovePercent
}

export function heaterConfirmReason(plan: WaterChangePlanResult): string {
  if (plan.heaterExposed) return 'This change takes the water level below the top of the heater.'
  return `This change is over ${plan.heaterConfirmAbovePercent} % of the water.`
}
