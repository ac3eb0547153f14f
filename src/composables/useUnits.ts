import { computed, ref } from 'vue'
import { fromCanonical, METRICS, displayPrecision, type MetricKey } from '@shared/metrics/index'

export const TEMPERATURE_UNIT_KEY = 'tw.temperatureUnit'
export type TemperatureUnit = 'C' | 'F'

function readStored(): TemperatureUnit {
  try {
    return localStorage.getItem(TEMPERATURE_UNIT_KEY) === 'F' ? 'F' : 'C'
  } catch {
    return 'C'
  }
}

// Module-level so the toggle in the user menu changes every screen at once.
const temperatureUnit = ref<TemperatureUnit>(readStored())

export function setTemperatureUnit(unit: TemperatureUnit) {
  temperatureUnit.value = unit
  try {
    localStorage.setItem(TEMPERATURE_UNIT_KEY, unit)
  } catch {
    // The choice then lasts for this tab only.
  }
}

/** Re-reads storage; tests and a second tab's change use it. */
export function reloadUnitPreference() {
  temperatureUnit.value = readStored()
}

/** The unit code a metric is shown in for this person. */
export function displayUnitOf(metric: MetricKey): string {
  return metric === 'temperature' ? temperatureUnit.value : METRICS[metric].unit
}

export function unitLabel(metric: MetricKey, unit = displayUnitOf(metric)): string {
  return METRICS[metric].units[unit]?.label ?? unit
}

/** A canonical value in the person's display unit; the canonical value itself if it cannot convert. */
export function toDisplayValue(metric: MetricKey, canonical: number): number {
  const converted = fromCanonical(metric, canonical, displayUnitOf(metric))
  return converted.ok ? converted.value : canonical
}

/** Just the number, rounded to the metric's display precision ("25.4", "7.21"). */
export function formatNumberOnly(metric: MetricKey, canonical: number | null | undefined): string {
  if (canonical == null || !Number.isFinite(canonical)) return '—'
  const unit = displayUnitOf(metric)
  const text = toDisplayValue(metric, canonical).toFixed(displayPrecision(metric, unit))
  return Number(text) === 0 ? (0).toFixed(displayPrecision(metric, unit)) : text
}

/** Number and unit ("25.4 °C", "pH 7.21"); pH reads better with its name in front. */
export function formatReading(metric: MetricKey, canonical: number | null | undefined): string {
  const number = formatNumberOnly(metric, canonical)
  if (number === '—') return number
  if (metric === 'ph') return `pH ${number}`
  return `${number} ${unitLabel(metric)}`
}

export function useUnits() {
  return {
    temperatureUnit: computed(() => temperatureUnit.value),
    setTemperatureUnit,
    displayUnitOf,
    unitLabel,
    toDisplayValue,
    formatReading,
    formatNumberOnly,
  }
}
