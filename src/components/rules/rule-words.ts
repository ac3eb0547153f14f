import { METRICS, displayPrecision, isMetricKey, type MetricKey } from '@shared/metrics/registry'
import { KINDS, RULE_KINDS, kindOf, type ConditionWords } from '@shared/rules/kinds'
import type { RuleSeverity, WatchRuleKind, WatchRuleSpec } from '@shared/rules/schema'
import { displayUnitOf, toDisplayValue, unitLabel } from '@/composables/useUnits'

/** Each kind's name, from the kinds table, in the schema's order. */
export const RULE_KIND_LABELS = Object.fromEntries(RULE_KINDS.map((kind) => [kind, KINDS[kind].label])) as Record<WatchRuleKind, string>

export const SEVERITY_LABELS: Record<RuleSeverity, string> = { warning: 'Warning', alarm: 'Alarm' }

/** "Temperature" reads "temperature" inside a sentence; "pH", "KH" and "GH" keep their capitals. */
export function metricInSentence(metric: string): string {
  const label = isMetricKey(metric) ? METRICS[metric].label : metric
  return /^[A-Z][a-z]/.test(label) ? label[0]!.toLowerCase() + label.slice(1) : label
}

/** "10 min", "1 h", "1 h 30 min", "24 h", "2 days". */
export function formatMinutes(minutes: number): string {
  const rounded = Math.round(minutes * 10) / 10
  if (rounded < 60) return `${rounded} min`
  if (rounded >= 2 * 1440 && rounded % 1440 === 0) return `${rounded / 1440} days`
  const hours = Math.floor(rounded / 60)
  const rest = Math.round((rounded - hours * 60) * 10) / 10
  return rest ? `${hours} h ${rest} min` : `${hours} h`
}

const unitSuffix = (metric: MetricKey) => {
  const unit = unitLabel(metric)
  // pH is its own unit: "pH is above 7.50" needs no second "pH".
  return metric === 'ph' ? '' : ` ${unit}`
}

/** A canonical value in the person's unit, with the unit: "28.0 °C", "7.50". */
export function ruleValue(metric: MetricKey, canonical: number): string {
  return `${toDisplayValue(metric, canonical).toFixed(displayPrecision(metric, displayUnitOf(metric)))}${unitSuffix(metric)}`
}

/** A difference (not a level) in the person's unit: 1 °C of change is 1.8 °F, not 33.8 °F. */
export function ruleChange(metric: MetricKey, canonicalDelta: number): string {
  const delta = toDisplayValue(metric, canonicalDelta) - toDisplayValue(metric, 0)
  return `${delta.toFixed(displayPrecision(metric, displayUnitOf(metric)))}${unitSuffix(metric)}`
}

/** The words a rule's condition is written with: the person's units. */
const WORDS: ConditionWords = { metric: metricInSentence, value: ruleValue, change: ruleChange, minutes: formatMinutes }

/** The condition alone, without the severity: "temperature is above 28.0 °C for 10 min; clears below 27.5 °C". */
export function describeCondition(spec: WatchRuleSpec): string {
  return kindOf(spec).describe(spec, WORDS)
}

/** The whole rule in plain words: "Alarm when temperature is above 28.0 °C for 10 min; clears below 27.5 °C". */
export function describeRule(rule: { severity: RuleSeverity; spec: WatchRuleSpec }): string {
  return `${SEVERITY_LABELS[rule.severity]} when ${describeCondition(rule.spec)}`
}

/** What a missing reading means to a rule, in plain words for the rule dialog. */
export function missingReadingItems() {
  return [
    { value: 'keep' as const, title: 'Keep the last state' },
    { value: 'tripped' as const, title: 'Count as tripped: opens the incident' },
    { value: 'clear' as const, title: 'Count as clear: closes the incident' },
  ]
}

/** The select's hint: when a reading counts as missing. */
export const missingReadingHint = (metric: string, afterMinutes: number) =>
  `When no ${metricInSentence(metric)} reading has come for ${formatMinutes(afterMinutes)}`
