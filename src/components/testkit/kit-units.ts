import { METRIC_KEYS, METRICS, supportedUnits, type MetricKey } from '@shared/metrics/index'
import { displayUnitOf } from '@/composables/useUnits'

/** The metrics a keeper reads off a kit or hand meter, in the registry's order. */
export const KIT_METRICS: MetricKey[] = METRIC_KEYS.filter((m) => METRICS[m].kitMetric)

export type KitUnits = Partial<Record<MetricKey, string>>

export const kitUnitsKey = (userId: number) => `tw.kitUnits.${userId}`

export function unitOptions(metric: MetricKey): Array<{ value: string; title: string }> {
  return supportedUnits(metric).map((code) => ({ value: code, title: METRICS[metric].units[code]?.label ?? code }))
}

/** Each person's kits report in their own units; the form opens with the ones they used last. */
export function loadKitUnits(userId: number | null | undefined): Record<MetricKey, string> {
  let stored: KitUnits = {}
  try {
    if (userId != null) stored = JSON.parse(localStorage.getItem(kitUnitsKey(userId)) ?? '{}') as KitUnits
  } catch {
    stored = {}
  }
  const out = {} as Record<MetricKey, string>
  for (const metric of KIT_METRICS) {
    const remembered = stored[metric]
    out[metric] = remembered && supportedUnits(metric).includes(remembered) ? remembered : displayUnitOf(metric)
  }
  return out
}

export function saveKitUnits(userId: number | null | undefined, units: KitUnits) {
  if (userId == null) return
  try {
    localStorage.setItem(kitUnitsKey(userId), JSON.stringify(units))
  } catch {
    // Remembering units is a convenience; the entry itself does not depend on it.
  }
}
