import { deviceReadingSchema } from '@shared/ingest/contract'
import { METRICS, isMetricKey } from '@shared/metrics/registry'
import { toCanonical } from '@shared/metrics/units'

export type CheckedReading =
  | { ok: true; metric: string; value: number; time: Date }
  /** `field`: the reading's member at fault (`metric`, `value`, `unit`, `time`), or `reading` for its shape. */
  | { ok: false; reason: string; field: string }

export type ReadingLimits = { maxFutureSeconds: number; maxAgeDays: number }

/** One reading through validation, unit conversion and the plausibility and clock checks. */
export function checkReading(raw: unknown, limits: ReadingLimits, now = Date.now()): CheckedReading {
  const parsed = deviceReadingSchema.safeParse(raw)
  if (!parsed.success) {
    const issue = parsed.error.issues[0]
    const field = issue.path.join('.') || 'reading'
    return { ok: false, reason: `invalid reading: ${field} ${issue.message}`, field }
  }
  const { metric, value, unit, time } = parsed.data
  if (!isMetricKey(metric)) return { ok: false, reason: `unknown metric "${metric}"`, field: 'metric' }
  const def = METRICS[metric]
  const converted = toCanonical(metric, value, unit ?? def.unit)
  if (!converted.ok) return { ok: false, reason: converted.reason, field: 'unit' }
  if (converted.value < def.plausible.min || converted.value > def.plausible.max) {
    return {
      ok: false,
      reason: `implausible ${metric} ${converted.value} ${def.unitLabel} (plausible ${def.plausible.min} to ${def.plausible.max})`,
      field: 'value',
    }
  }
  const at = new Date(time)
  if (at.getTime() > now + limits.maxFutureSeconds * 1000) {
    return { ok: false, reason: `time ${time} is more than ${limits.maxFutureSeconds} s in the future (check the device clock)`, field: 'time' }
  }
  if (at.getTime() < now - limits.maxAgeDays * 86400_000) {
    return { ok: false, reason: `time ${time} is older than ${limits.maxAgeDays} days`, field: 'time' }
  }
  return { ok: true, metric, value: converted.value, time: at }
}
