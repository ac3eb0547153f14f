import { METRICS, toCanonical, type MetricKey } from '@shared/metrics/index'
import type { Targets } from '@shared/schemas/tanks'
import { testKitEntryInputSchema, type TestKitEntryInput } from '@shared/schemas/test-kit'
import { formatBand } from '@/components/labels'
import { KIT_METRICS } from './kit-units'

export interface KitDraft {
  /** `datetime-local` text in the keeper's own zone. */
  takenAt: string
  values: Partial<Record<MetricKey, string>>
  units: Record<MetricKey, string>
  notes: string
}

export interface KitCheck {
  payload: TestKitEntryInput | null
  /** Blocking: field → message (`_form`, `takenAt`, or a metric). */
  errors: Record<string, string>
  /** Blocking too: a value no kit could read, most often a unit mix-up. */
  warnings: Partial<Record<MetricKey, string>>
  /** Not blocking: outside this tank's target band. */
  notes: Partial<Record<MetricKey, string>>
  /** Canonical values of the entry, for the explanations after saving. */
  canonical: Partial<Record<MetricKey, number>>
  /** The metric behind each `values.<i>` the server may complain about. */
  order: MetricKey[]
}

/** "7.2", "7,2" (a decimal comma), " 12 " → numbers; anything else is not a number. */
export function parseDecimal(text: string): number | null {
  const trimmed = text.trim().replace(/^(-?\d*),(\d+)$/, '$1.$2')
  if (!/^-?(\d+\.?\d*|\.\d+)$/.test(trimmed)) return null
  const value = Number(trimmed)
  return Number.isFinite(value) ? value : null
}

const range = (metric: MetricKey) => {
  const { min, max } = METRICS[metric].plausible
  const unit = METRICS[metric].unitLabel
  return unit === 'pH' ? `${min}–${max}` : `${min}–${max} ${unit}`
}

export function checkDraft(draft: KitDraft, targets: Targets, context: { temperatureC?: number } = {}): KitCheck {
  const errors: Record<string, string> = {}
  const warnings: KitCheck['warnings'] = {}
  const notes: KitCheck['notes'] = {}
  const canonical: KitCheck['canonical'] = {}
  const values: TestKitEntryInput['values'] = []
  const order: MetricKey[] = []

  for (const metric of KIT_METRICS) {
    const text = draft.values[metric]?.trim() ?? ''
    if (!text) continue
    const value = parseDecimal(text)
    if (value == null) {
      errors[metric] = 'enter a number'
      continue
    }
    values.push({ metric, value, unit: draft.units[metric] })
    order.push(metric)
  }

  // Oxygen in % saturation and specific gravity at the water temperature need it: this entry's if given, else the tank's latest.
  const temperature = values.find((v) => v.metric === 'temperature')
  const temperatureC = temperature ? toCanonical('temperature', temperature.value, temperature.unit) : null
  const ctx = { temperatureC: temperatureC?.ok ? temperatureC.value : context.temperatureC }

  for (const [index, { metric, value, unit }] of values.entries()) {
    const converted = toCanonical(metric, value, unit, ctx)
    if (!converted.ok) {
      const needsTemperature = METRICS[metric].units[unit]?.needs === 'temperatureC'
      const name = metric === 'oxygen' ? 'oxygen' : METRICS[metric].label.toLowerCase()
      warnings[metric] = needsTemperature ? `enter the temperature too, or give ${name} in ${METRICS[metric].unitLabel}` : converted.reason
      continue
    }
    canonical[metric] = converted.value
    // The server reads a temperature-bound unit with the entry's own temperature; with the tank's latest instead, send the converted value.
    if (!temperature && METRICS[metric].units[unit]?.needs === 'temperatureC') values[index] = { metric, value: converted.value, unit: METRICS[metric].unit }
    const { min, max } = METRICS[metric].plausible
    if (converted.value < min || converted.value > max) {
      warnings[metric] = `No kit reads this: ${METRICS[metric].label} runs ${range(metric)}. Check the value and the unit.`
      continue
    }
    const band = targets[metric]
    if (band && (converted.value < band.min || converted.value > band.max)) {
      notes[metric] = `Outside this tank's target band (${formatBand(metric, band)}).`
    }
  }

  const takenAt = draft.takenAt ? new Date(draft.takenAt) : null
  if (draft.takenAt && (!takenAt || Number.isNaN(takenAt.getTime()))) errors.takenAt = 'enter a date and time'
  else if (takenAt && takenAt.getTime() > Date.now() + 5 * 60_000) errors.takenAt = 'cannot be in the future'

  const parsed = testKitEntryInputSchema.safeParse({
    takenAt: takenAt && !errors.takenAt ? takenAt.toISOString() : undefined,
    values,
    notes: draft.notes,
  })
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const [head, index] = issue.path
      if (head === 'values' && typeof index === 'number' && order[index]) errors[order[index]!] ??= issue.message
      else if (head === 'values' || head === undefined) {
        // With every typed value refused already, "enter at least one" would only confuse.
        if (!order.length && !Object.keys(errors).length) errors._form = 'Enter at least one value.'
      } else errors[String(head)] ??= issue.message
    }
  }
  const blocked = Object.keys(errors).length > 0 || Object.keys(warnings).length > 0
  return { payload: parsed.success && !blocked ? parsed.data : null, errors, warnings, notes, canonical, order }
}
