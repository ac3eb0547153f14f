import { co2FromPhKh, co2RuleOfThumb, oxygenSolubilityMgL, percentSaturation, unionisedAmmoniaFraction, unionisedAmmoniaMgL } from '@shared/chemistry/index'
import type { MetricKey } from '@shared/metrics/registry'

export type Values = Partial<Record<MetricKey, number>>
export type Origin = 'entry' | 'latest'

export interface Used {
  metric: MetricKey
  value: number
  origin: Origin
}

export type Insight<T> = { ok: true; result: T; used: Used[] } | { ok: false; reason: string }

export interface KitInsights {
  ammonia: Insight<{ unionisedMgL: number; percent: number }>
  co2: Insight<{ mgL: number; ruleOfThumbMgL: number }>
  oxygen: Insight<{ saturationMgL: number; percent: number | null }>
}

export const GUIDANCE_CAUTION = 'These figures are guidance; confirm with your test kit and ask an aquatic veterinarian about sick fish.'

const LABELS: Partial<Record<MetricKey, string>> = { ammonia: 'ammonia', ph: 'pH', temperature: 'temperature', kh: 'KH', oxygen: 'oxygen' }

/** The entry's own value first; the tank's latest reading stands in when the keeper did not test it. */
function pick(metrics: MetricKey[], entry: Values, latest: Values): Used[] | string {
  const used: Used[] = []
  const missing: string[] = []
  for (const metric of metrics) {
    if (entry[metric] != null) used.push({ metric, value: entry[metric]!, origin: 'entry' })
    else if (latest[metric] != null) used.push({ metric, value: latest[metric]!, origin: 'latest' })
    else missing.push(LABELS[metric] ?? metric)
  }
  return missing.length ? `needs ${missing.join(' and ')}` : used
}

function attempt<T>(used: Used[] | string, compute: (v: Record<string, number>) => T): Insight<T> {
  if (typeof used === 'string') return { ok: false, reason: used }
  const v = Object.fromEntries(used.map((u) => [u.metric, u.value]))
  try {
    return { ok: true, result: compute(v), used }
  } catch (error) {
    // The formulas are fitted for 0–40 °C and (for CO2) pH 5–9; outside that they say nothing.
    return { ok: false, reason: error instanceof RangeError ? `outside what the formula covers (${error.message})` : String(error) }
  }
}

/** All values canonical: mg/L, pH, °C, °dKH. */
export function kitInsights(entry: Values, latest: Values): KitInsights {
  const ammonia = attempt(pick(['ammonia', 'ph', 'temperature'], entry, latest), (v) => ({
    unionisedMgL: unionisedAmmoniaMgL(v.ammonia!, v.ph!, v.temperature!),
    percent: 100 * unionisedAmmoniaFraction(v.ph!, v.temperature!),
  }))
  const co2 = attempt(pick(['ph', 'kh', 'temperature'], entry, latest), (v) => ({
    mgL: co2FromPhKh(v.ph!, v.kh!, v.temperature!),
    ruleOfThumbMgL: co2RuleOfThumb(v.ph!, v.kh!),
  }))
  const temperature = pick(['temperature'], entry, latest)
  if (typeof temperature !== 'string' && entry.oxygen != null) temperature.push({ metric: 'oxygen', value: entry.oxygen, origin: 'entry' })
  const oxygen = attempt(temperature, (v) => ({
    saturationMgL: oxygenSolubilityMgL(v.temperature!),
    percent: entry.oxygen != null ? percentSaturation(entry.oxygen, v.temperature!) : null,
  }))
  return { ammonia, co2, oxygen }
}
