// What one tank's report is made of, read from the stored records of the period.
import { Op } from 'sequelize'
import { METRICS } from '@shared/metrics/registry'
import { tallyCareTask } from '@shared/report/care'
import type { ReportPeriod } from '@shared/report/period'
import { addDays, formatLocalDate, localDateAt } from '@shared/time/zoned'
import { chartSeries } from '@shared/report/series'
import { stability, type TimedValue } from '@shared/report/stability'
import type { ReportCareTask, ReportIncident, ReportLivestockChange, ReportMetric, TankReport } from '@shared/schemas/reports'
import type { AppContext } from '../context'
import type { Tank } from '../models'
import { photosInPeriod } from './report-photos'
import { periodValues } from '../readings'

export const REPORT_METRICS = ['temperature', 'ph'] as const

/**
 * However regular a sensor was, a step longer than this is a gap: a value six hours old says
 * nothing about the water now. A pH tested by hand once a week therefore shows min and max but no
 * time in band, which is the honest answer.
 */
export const REPORT_MAX_GAP_MS = 6 * 3_600_000

async function metricReadings(ctx: AppContext, tankId: number, metric: string, from: number, to: number): Promise<TimedValue[]> {
  // Hours the retention job has rolled up come back as one reading of their mean at the half hour.
  const rows = await periodValues(ctx.sequelize, tankId, metric, new Date(from), new Date(to))
  return rows.map((r) => ({ at: new Date(r.time).getTime(), value: Number(r.value) }))
}

const iso = (ms: number) => new Date(ms).toISOString()

async function metricSection(ctx: AppContext, tank: Tank, metric: (typeof REPORT_METRICS)[number], from: number, to: number): Promise<ReportMetric> {
  const readings = await metricReadings(ctx, tank.id, metric, from, to)
  const target = tank.targets?.[metric]
  const band = target ? { min: target.min ?? null, max: target.max ?? null } : null
  const s = stability({ readings, from, to, band, maxGapMs: REPORT_MAX_GAP_MS })
  const def = METRICS[metric]
  return {
    metric,
    label: def.label,
    unitLabel: def.unitLabel,
    band,
    readings: s.readings,
    coveragePercent: s.coveragePercent,
    timeInBandPercent: s.timeInBandPercent,
    belowMs: s.belowMs,
    aboveMs: s.aboveMs,
    min: s.min,
    max: s.max,
    mean: s.mean,
    gapLimitMs: s.gapLimitMs,
    gaps: s.gaps.map((g) => ({ from: iso(g.from), to: iso(g.to), durationMs: g.durationMs })),
    series: chartSeries(readings, from, to, s.gaps),
  }
}

async function incidentsSection(ctx: AppContext, tankId: number, from: number, to: number) {
  const rows = await ctx.models.Incident.findAll({
    where: { tankId, openedAt: { [Op.gte]: new Date(from), [Op.lt]: new Date(to) } },
    order: [['openedAt', 'ASC']],
  })
  const incidents: ReportIncident[] = rows.map((i) => ({
    id: i.id,
    title: i.title,
    severity: i.severity,
    metric: i.metric,
    openedAt: i.openedAt.toISOString(),
    acknowledgedAt: i.acknowledgedAt?.toISOString() ?? null,
    resolvedAt: i.resolvedAt?.toISOString() ?? null,
    timeToAcknowledgeMs: i.acknowledgedAt ? i.acknowledgedAt.getTime() - i.openedAt.getTime() : null,
    timeToResolveMs: i.resolvedAt ? i.resolvedAt.getTime() - i.openedAt.getTime() : null,
  }))
  const mean = (values: Array<number | null>) => {
    const known = values.filter((v): v is number => v !== null)
    return known.length ? known.reduce((a, b) => a + b, 0) / known.length : null
  }
  return {
    incidents,
    incidentSummary: {
      opened: incidents.length,
      stillOpen: incidents.filter((i) => i.resolvedAt === null).length,
      meanTimeToAcknowledgeMs: mean(incidents.map((i) => i.timeToAcknowledgeMs)),
      meanTimeToResolveMs: mean(incidents.map((i) => i.timeToResolveMs)),
    },
  }
}

async function careSection(ctx: AppContext, tankId: number, period: ReportPeriod, to: number) {
  const { models } = ctx
  const tasks = await models.CareTask.findAll({ where: { tankId, createdAt: { [Op.lt]: new Date(to) } }, order: [['id', 'ASC']] })
  const doneEntries = await models.CareLogEntry.findAll({
    where: { tankId, kind: 'task_done', careTaskId: { [Op.ne]: null }, at: { [Op.lt]: new Date(to) } },
    attributes: ['careTaskId', 'at'],
  })
  // Finishing a water change marks the water-change tasks done without a task_done entry.
  const changes = await models.WaterChange.findAll({ where: { tankId, status: 'finished', finishedAt: { [Op.lt]: new Date(to) } }, attributes: ['finishedAt'] })
  // While the period runs, only days up to today can have fallen due.
  const endDate = to < period.to ? formatLocalDate(addDays(localDateAt(period.timeZone, to), 1)) : period.endDate
  const bounded = { ...period, to, endDate: endDate < period.endDate ? endDate : period.endDate }
  const rows: ReportCareTask[] = []
  for (const task of tasks) {
    const doneAt = doneEntries.filter((e) => e.careTaskId === task.id).map((e) => e.at.getTime())
    if (task.kind === 'water_change') for (const c of changes) if (c.finishedAt) doneAt.push(c.finishedAt.getTime())
    const tally = tallyCareTask({ recurrence: task.recurrence, startsOn: task.startsOn, createdAt: task.createdAt.getTime(), doneAt }, bounded)
    // A switched-off task shows only if it was done in the period anyway.
    if (!task.active && tally.done === 0) continue
    rows.push({ id: task.id, title: task.title, kind: task.kind, due: task.active ? tally.due : 0, done: tally.done })
  }
  return { tasks: rows, due: rows.reduce((a, t) => a + t.due, 0), done: rows.reduce((a, t) => a + t.done, 0) }
}

async function waterSection(ctx: AppContext, tankId: number, from: number, to: number) {
  const changes = await ctx.models.WaterChange.findAll({
    where: { tankId, status: 'finished', finishedAt: { [Op.gte]: new Date(from), [Op.lt]: new Date(to) } },
    attributes: ['litresReplaced'],
  })
  return { changes: changes.length, litres: changes.reduce((sum, c) => sum + (c.litresReplaced ?? 0), 0) }
}

async function livestockSection(ctx: AppContext, tankId: number, from: number, to: number) {
  const entries = await ctx.models.CareLogEntry.findAll({
    where: { tankId, kind: { [Op.in]: ['livestock_in', 'livestock_out'] }, at: { [Op.gte]: new Date(from), [Op.lt]: new Date(to) } },
    order: [
      ['at', 'ASC'],
      ['id', 'ASC'],
    ],
  })
  const changes: ReportLivestockChange[] = entries.map((e) => {
    const values = e.values as Record<string, unknown>
    const kind = e.kind === 'livestock_in' ? 'added' : typeof values.losses === 'number' ? 'lost' : 'removed'
    const count = Number(kind === 'lost' ? values.losses : values.count) || 0
    return { at: e.at.toISOString(), kind, text: e.text, count }
  })
  const total = (kind: ReportLivestockChange['kind']) => changes.filter((c) => c.kind === kind).reduce((a, c) => a + c.count, 0)
  return { added: total('added'), removed: total('removed'), lost: total('lost'), changes }
}

/** One tank over [period.from, to), where `to` is the period's end or now while it runs. */
export async function tankReport(ctx: AppContext, tank: Tank, period: ReportPeriod, to: number): Promise<TankReport> {
  const from = period.from
  const metrics: ReportMetric[] = []
  for (const metric of REPORT_METRICS) metrics.push(await metricSection(ctx, tank, metric, from, to))
  return {
    tankId: tank.id,
    name: tank.name,
    volumeLitres: tank.volumeLitres,
    metrics,
    ...(await incidentsSection(ctx, tank.id, from, to)),
    care: await careSection(ctx, tank.id, period, to),
    water: await waterSection(ctx, tank.id, from, to),
    livestock: await livestockSection(ctx, tank.id, from, to),
    photos: await photosInPeriod(ctx, tank.id, new Date(from), new Date(to)),
  }
}
