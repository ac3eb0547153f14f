import { toCanonical, type MetricKey } from '@shared/metrics/index'
import type { KitValue, PublicTestKitEntry } from '@shared/schemas/test-kit'
import type { TimedValue } from '@/components/charts/options'

/** The entry's temperature in °C, which converting oxygen from % saturation needs. */
export function entryTemperatureC(values: KitValue[]): number | undefined {
  const temperature = values.find((v) => v.metric === 'temperature')
  if (!temperature) return undefined
  const converted = toCanonical('temperature', temperature.value, temperature.unit)
  return converted.ok ? converted.value : undefined
}

/** One value of an entry in canonical units, or null when it cannot be converted. */
export function canonicalKitValue(value: KitValue, temperatureC?: number): number | null {
  const converted = toCanonical(value.metric, value.value, value.unit, { temperatureC })
  return converted.ok ? converted.value : null
}

/** Test-kit readings per metric, canonical, for drawing over the charts. */
export function kitPointsByMetric(entries: PublicTestKitEntry[]): Partial<Record<MetricKey, TimedValue[]>> {
  const out: Partial<Record<MetricKey, TimedValue[]>> = {}
  for (const entry of entries) {
    const temperatureC = entryTemperatureC(entry.values)
    for (const value of entry.values) {
      const canonical = canonicalKitValue(value, temperatureC)
      if (canonical == null) continue
      ;(out[value.metric] ??= []).push({ t: entry.takenAt, value: canonical, source: 'test_kit' })
    }
  }
  for (const list of Object.values(out)) list.sort((a, b) => Date.parse(a.t) - Date.parse(b.t))
  return out
}
