import { PROBE_TRUST, probeKitDifference } from '@shared/calibration'
import type { MetricKey } from '@shared/metrics/registry'
import { defaultProbeKitSpec } from '@shared/rules/probe-kit'
import type { ProbeCheck } from '@shared/schemas/test-kit'
import type { AppContext } from '../context'
import { rulesService } from '../incidents'
import { nearestProbeReading, type ReadingRow } from '../readings'

/**
 * Each stored kit value a probe of the tank also measures, against the probe's reading nearest
 * to it: the same comparison the tank's `probe_kit` rule makes (its tolerance, else the usual
 * one), so the saved entry can say at once what the watch will say.
 */
export async function probeChecksFor(ctx: AppContext, tankId: number, rows: ReadingRow[]): Promise<ProbeCheck[]> {
  const kitRows = rows.filter((r) => PROBE_TRUST[r.metric as MetricKey])
  if (!kitRows.length) return []
  const rules = await rulesService(ctx).effectiveRules({ tankIds: [tankId] })
  const devices = await ctx.models.Device.findAll({ where: { tankId, revokedAt: null }, attributes: ['metrics', 'intervalSeconds'] })
  const checks: ProbeCheck[] = []
  for (const row of kitRows) {
    const metric = row.metric as MetricKey
    const probes = devices.filter((d) => d.metrics.includes(metric))
    if (!probes.length) continue
    const spec =
      rules.map((r) => r.rule.spec).find((s): s is Extract<typeof s, { kind: 'probe_kit' }> => s.kind === 'probe_kit' && s.metric === metric) ??
      defaultProbeKitSpec(metric)!
    const withinMs = Math.max(spec.withinMinutes * 60_000, ...probes.map((d) => d.intervalSeconds * 1000))
    const probe = await nearestProbeReading(ctx.sequelize, tankId, metric, row.time, withinMs)
    if (!probe) continue
    const verdict = probeKitDifference(row.value, probe.value, { amount: spec.tolerance, percent: spec.tolerancePercent })
    checks.push({ metric, kit: row.value, probe: probe.value, probeAt: probe.time.toISOString(), ...verdict })
  }
  return checks
}
