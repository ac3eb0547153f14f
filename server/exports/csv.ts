import type { Actor } from '../access/actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import { METRICS, isMetricKey } from '@shared/metrics'
import type { ExportKind, ExportRangeQuery } from '@shared/schemas/exports'
import { canSeeSite, visibleTank } from '../access/scope'
import { readingsCsvSql, type ReadingCsvRow } from '../readings'
import { eachBatch, snapshot } from './cursor'
import { exportFileName, zonedFormatter } from './format'
import { perContext } from '../platform/per-context'

export type ExportScope = { kind: 'tank' | 'site'; id: number }
export type CsvCell = string | number | null
/** Where CSV rows go: `begin` once the first batch has been read, `rows` may wait for the client. */
export interface CsvSink {
  begin(fileName: string, header: string[]): void
  rows(rows: CsvCell[][]): Promise<boolean>
}

type Target = { organizationId: number; timeZone: string; label: string; where: string; scopeId: number }

const SOURCE_LABELS: Record<string, string> = { test_kit: 'test kit', import: 'import' }

const unitOf = (metric: string) => (isMetricKey(metric) ? METRICS[metric].unit : '')

type IncidentRow = {
  opened_at: Date
  tank: string
  title: string
  metric: string
  severity: string
  state: string
  first_value: number | null
  peak_value: number | null
  acknowledged_at: Date | null
  acknowledged_by: string | null
  acknowledge_note: string | null
  resolved_at: Date | null
  resolved_by: string | null
  resolve_note: string | null
}
type CareLogRow = { at: Date; tank: string; kind: string; text: string; by: string | null; values: Record<string, unknown> }

/** One definition per export: its header, its query over `tanks t`, and how a row becomes cells. */
const EXPORTS: Record<ExportKind, { header: string[]; sql: (where: string) => string; cells: (row: never, time: (d: Date | null) => string) => CsvCell[] }> = {
  readings: {
    header: ['time', 'tank', 'metric', 'value', 'unit', 'source'],
    sql: readingsCsvSql,
    cells: (row: ReadingCsvRow, time) => [
      time(row.time),
      row.tank,
      row.metric,
      row.value,
      unitOf(row.metric),
      row.source === 'device' ? (row.device ?? 'device') : (SOURCE_LABELS[row.source] ?? row.source),
    ],
  },
  incidents: {
    header: [
      'opened_at',
      'tank',
      'title',
      'metric',
      'severity',
      'state',
      'first_value',
      'peak_value',
      'unit',
      'acknowledged_at',
      'acknowledged_by',
      'acknowledge_note',
      'resolved_at',
      'resolved_by',
      'resolve_note',
    ],
    sql: (where) => `
      SELECT i.opened_at, t.name AS tank, i.title, i.metric, i.severity, i.state, i.first_value, i.peak_value,
        i.acknowledged_at, ack.name AS acknowledged_by, i.acknowledge_note, i.resolved_at, res.name AS resolved_by, i.resolve_note
      FROM incidents i
      JOIN tanks t ON t.id = i.tank_id
      LEFT JOIN users ack ON ack.id = i.acknowledged_by
      LEFT JOIN users res ON res.id = i.resolved_by
      WHERE ${where} AND i.opened_at >= :from AND i.opened_at < :to
      ORDER BY i.opened_at, i.id`,
    cells: (row: IncidentRow, time) => [
      time(row.opened_at),
      row.tank,
      row.title,
      row.metric,
      row.severity,
      row.state,
      row.first_value,
      row.peak_value,
      unitOf(row.metric),
      time(row.acknowledged_at),
      row.acknowledged_by,
      row.acknowledge_note,
      time(row.resolved_at),
      row.resolved_by,
      row.resolve_note,
    ],
  },
  'care-log': {
    header: ['time', 'tank', 'kind', 'text', 'by', 'details'],
    sql: (where) => `
      SELECT c.at, t.name AS tank, c.kind, c.text, u.name AS by, c.values
      FROM care_log c
      JOIN tanks t ON t.id = c.tank_id
      LEFT JOIN users u ON u.id = c.user_id
      WHERE ${where} AND c.at >= :from AND c.at < :to
      ORDER BY c.at, c.id`,
    cells: (row: CareLogRow, time) => [
      time(row.at),
      row.tank,
      row.kind,
      row.text,
      row.by,
      row.values && Object.keys(row.values).length ? JSON.stringify(row.values) : '',
    ],
  },
}

export const exportCsvService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  /** The tank or site an actor asks for; another organization's or another site's answers 404. */
  async function targetOf(actor: Actor, scope: ExportScope): Promise<Target> {
    if (scope.kind === 'tank') {
      const tank = await visibleTank(ctx, actor, scope.id)
      return { organizationId: actor.organizationId, timeZone: tank.site!.timeZone, label: tank.name, where: 't.id = :scopeId', scopeId: tank.id }
    }
    const site = await models.Site.findByPk(scope.id)
    if (!canSeeSite(actor, site)) throw notFound('Site not found')
    return { organizationId: actor.organizationId, timeZone: site!.timeZone, label: site!.name, where: 't.site_id = :scopeId', scopeId: site!.id }
  }

  return {
    targetOf,

    /** Streams one CSV export into `sink`, one cursor batch at a time, from one snapshot. */
    async write(actor: Actor, kind: ExportKind, scope: ExportScope, range: ExportRangeQuery, sink: CsvSink): Promise<void> {
      const target = await targetOf(actor, scope)
      const definition = EXPORTS[kind]
      const time = zonedFormatter(target.timeZone)
      const day = (iso: string) => time(new Date(iso)).slice(0, 10)
      const fileName = exportFileName(['tankwarden', kind, target.label, day(range.from), 'to', day(range.to)], 'csv')
      const where = `t.organization_id = :organizationId AND ${target.where}`
      const replacements = { organizationId: target.organizationId, scopeId: target.scopeId, from: range.from, to: range.to }
      let begun = false
      const begin = () => {
        if (!begun) sink.begin(fileName, definition.header)
        begun = true
      }
      const transaction = await snapshot(sequelize)
      try {
        await eachBatch<never>(sequelize, transaction, definition.sql(where), replacements, async (rows) => {
          begin()
          return sink.rows(rows.map((row) => definition.cells(row, time)))
        })
        await transaction.commit()
      } catch (error) {
        await transaction.rollback()
        throw error
      }
      begin()
    },
  }
})
