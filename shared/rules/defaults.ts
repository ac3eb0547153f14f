import { plainNumber } from '../plain-number'
import type { MetricKey } from '../metrics/registry'
import { METRICS } from '../metrics/registry'
import { defaultProbeKitSpec } from './probe-kit'
import type { RuleSeverity, WatchRuleSpec } from './schema'
import { defaultStuckSpec } from './stuck'

export interface TankRuleDefaultsInput {
  /** The tank's kind; today every kind gets the same starter set. */
  kind: string
  targets: {
    temperature?: { min: number; max: number }
    ph?: { min: number; max: number }
  }
  heaterTopCm?: number
}

export interface DefaultRule {
  name: string
  severity: RuleSeverity
  spec: WatchRuleSpec
}

// Starter thresholds a keeper can edit afterwards; all of them are common practice rather
// than a published standard: ten minutes rides out a door left open or a lid lifted, half a
// degree of hysteresis keeps a thermostat's own swing from reopening incidents, and a pH drift
// of 0.3 in a day is the usual point at which keepers start looking for a cause.
const TEMPERATURE_HOLD_MINUTES = 10
const TEMPERATURE_CLEAR_MARGIN = 0.5
const HEATER_WARNING_MARGIN_CM = 2
const TEMPERATURE_QUIET_MINUTES = 15
const PH_MAX_CHANGE = 0.3
const PH_WINDOW_MINUTES = 24 * 60

const plain = (n: number) => plainNumber(n, 2)

/** The watch rules a new tank starts with. */
export function defaultRulesForTank(input: TankRuleDefaultsInput): DefaultRule[] {
  const rules: DefaultRule[] = []
  const temperature = input.targets.temperature
  if (temperature) {
    rules.push({
      name: `Temperature above ${plain(temperature.max)} °C for ${TEMPERATURE_HOLD_MINUTES} min`,
      severity: 'alarm',
      spec: {
        kind: 'above',
        metric: 'temperature',
        limit: temperature.max,
        holdMinutes: TEMPERATURE_HOLD_MINUTES,
        clearMargin: TEMPERATURE_CLEAR_MARGIN,
      },
    })
    rules.push({
      name: `Temperature below ${plain(temperature.min)} °C for ${TEMPERATURE_HOLD_MINUTES} min`,
      severity: 'alarm',
      spec: {
        kind: 'below',
        metric: 'temperature',
        limit: temperature.min,
        holdMinutes: TEMPERATURE_HOLD_MINUTES,
        clearMargin: TEMPERATURE_CLEAR_MARGIN,
      },
    })
  }
  if (input.heaterTopCm !== undefined) {
    rules.push({
      name: `Water level within ${HEATER_WARNING_MARGIN_CM} cm of the heater top`,
      severity: 'warning',
      spec: { kind: 'heater_line', marginCm: HEATER_WARNING_MARGIN_CM, holdMinutes: 0, clearMargin: 0.5 },
    })
    rules.push({
      name: 'Water level at or below the heater top',
      severity: 'alarm',
      spec: { kind: 'heater_line', marginCm: 0, holdMinutes: 0, clearMargin: 0.5 },
    })
  }
  rules.push({
    name: `No temperature reading for ${TEMPERATURE_QUIET_MINUTES} min`,
    severity: 'warning',
    spec: { kind: 'quiet', metric: 'temperature', quietMinutes: TEMPERATURE_QUIET_MINUTES },
  })
  rules.push({
    name: `pH changed by more than ${plain(PH_MAX_CHANGE)} in 24 h`,
    severity: 'warning',
    spec: { kind: 'rate', metric: 'ph', maxChange: PH_MAX_CHANGE, windowMinutes: PH_WINDOW_MINUTES },
  })
  return rules
}

/**
 * The rules a probe brings to its tank, per metric it reports that probes can be judged on
 * (PROBE_TRUST): it disagrees with the test kit, and it stands still. Both are watches.
 */
export function defaultProbeRules(metrics: readonly MetricKey[]): DefaultRule[] {
  const rules: DefaultRule[] = []
  for (const metric of metrics) {
    const kit = defaultProbeKitSpec(metric)
    const stuck = defaultStuckSpec(metric)
    const label = METRICS[metric].label
    if (kit) rules.push({ name: `${label} probe disagrees with the test kit`, severity: 'warning', spec: kit })
    if (stuck) rules.push({ name: `${label} probe may be frozen or out of the water`, severity: 'warning', spec: stuck })
  }
  return rules
}
