import { METRICS, isMetricKey } from '../metrics/registry'
import { kindOf, type MeasureWords } from './kinds'
import type { WatchRuleSpec } from './schema'

/**
 * What an incident measured, in words people act on, the same in the mail, on the tile and in
 * the timeline: "no temperature reading for 15 min", "pH fell 0.31 in 24 h", "temperature
 * 23.5 °C, above 10–22 °C". Canonical units at the metric's display precision from the registry;
 * limits drop trailing zeros ("10–22 °C"), measured values keep them ("23.0 °C").
 */
export interface MeasurementInput {
  spec: WatchRuleSpec | null
  metric: string
  /** The compared quantity: the reading for level rules, the signed change for `rate`, minutes of silence for `quiet`. */
  value: number | null
  /** For `heater_line`: the top of the heater, cm above the floor. */
  heaterTopCm?: number
}

const precisionOf = (metric: string) => (isMetricKey(metric) ? METRICS[metric].precision : 2)
const labelOf = (metric: string) => (isMetricKey(metric) ? METRICS[metric].label : metric)
const unitOf = (metric: string) => (isMetricKey(metric) ? METRICS[metric].unitLabel : '')

/** "temperature", but "pH", "KH", "GH" keep their capitals. */
export function metricWord(metric: string): string {
  const label = labelOf(metric)
  return /^[A-Z][a-z]/.test(label) ? label[0]!.toLowerCase() + label.slice(1) : label
}

const fixed = (metric: string, v: number) => v.toFixed(precisionOf(metric))
const trimmed = (metric: string, v: number) => String(Number(v.toFixed(precisionOf(metric))))
const withUnit = (metric: string, text: string) => (metric === 'ph' ? text : `${text} ${unitOf(metric)}`)

/** "15 min", "2 h", "1 h 30 min", "3 days". */
export function durationWords(minutes: number): string {
  const m = Math.max(0, Math.round(minutes))
  if (m < 60) return `${m} min`
  if (m >= 2 * 1440 && m % 1440 === 0) return `${m / 1440} days`
  const h = Math.floor(m / 60)
  return m % 60 ? `${h} h ${m % 60} min` : `${h} h`
}

/** The value alone, as measured: "23.5 °C", "pH 6.42", "12.0 cm". */
export function measuredValue(metric: string, value: number): string {
  return metric === 'ph' ? `pH ${fixed(metric, value)}` : withUnit(metric, fixed(metric, value))
}

const WORDS: MeasureWords = {
  metric: metricWord,
  measured: (metric, v) => withUnit(metric, fixed(metric, v)),
  limit: (metric, v) => withUnit(metric, trimmed(metric, v)),
  number: trimmed,
  minutes: durationWords,
}

/** The whole phrase, in the words of the rule's kind (shared/rules/kinds.ts); starts lower case unless the metric keeps its capitals (pH). */
export function describeMeasurement({ spec, metric, value, heaterTopCm }: MeasurementInput): string {
  const word = metricWord(metric)
  if (value === null || !Number.isFinite(value)) return spec && !kindOf(spec).asksMissingReading ? `no ${word} reading` : word
  return spec ? kindOf(spec).measure(spec, metric, value, WORDS, heaterTopCm) : `${word} ${withUnit(metric, fixed(metric, value))}`
}
