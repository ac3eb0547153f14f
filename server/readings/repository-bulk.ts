// Readings in bulk, for the callers outside this folder: removing a test-kit entry's readings,
// the demo's month of history, the CSV and backup streams, a restore, and the rollup table's
// backup definition. (Live ingest writes through `batch-writer.ts`.)
import type { Sequelize, Transaction } from 'sequelize'

/** Removes every reading one source wrote (a test-kit entry edited or deleted). */
export async function deleteReadingsOfSource(sequelize: Sequelize, sourceKey: string, transaction: Transaction): Promise<void> {
  await sequelize.query('DELETE FROM readings WHERE source_key = $1', { bind: [sourceKey], transaction })
}

/** One device's readings of one tank in one statement: columns as arrays, unnested by PostgreSQL. */
export async function insertDeviceSeries(
  sequelize: Sequelize,
  series: { sourceKey: string; tankId: number; metrics: string[]; epochSeconds: number[]; values: number[] },
): Promise<void> {
  await sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT $1, m, to_timestamp(s), $2, v, 'device' FROM unnest($3::text[], $4::float8[], $5::float8[]) AS u(m, s, v)`,
    { bind: [series.sourceKey, series.tankId, series.metrics, series.epochSeconds, series.values] },
  )
}

/** Restored readings, already carrying their new tank ids and source keys: one column per array. */
export async function insertRestoredReadings(
  sequelize: Sequelize,
  columns: { tankIds: unknown[]; metrics: unknown[]; times: unknown[]; values: unknown[]; sources: unknown[]; sourceKeys: unknown[] },
  transaction: Transaction,
): Promise<void> {
  await sequelize.query(
    `INSERT INTO readings (tank_id, metric, time, value, source, source_key)
     SELECT * FROM unnest($1::integer[], $2::text[], $3::timestamptz[], $4::double precision[], $5::text[], $6::text[])`,
    { bind: [columns.tankIds, columns.metrics, columns.times, columns.values, columns.sources, columns.sourceKeys], transaction },
  )
}

/** A CSV export's row of readings (see `readingsCsvSql`). */
export type ReadingCsvRow = { time: Date; tank: string; metric: string; value: number; source: string; device: string | null }

/**
 * The CSV export's query for a cursor: readings `r` of tanks `t` matching `where` (named
 * replacements; `:from` and `:to` bound the time), with the device's name, in file order.
 */
export function readingsCsvSql(where: string): string {
  return `
      SELECT r.time, t.name AS tank, r.metric, r.value, r.source, d.name AS device
      FROM readings r
      JOIN tanks t ON t.id = r.tank_id
      LEFT JOIN devices d ON r.source = 'device' AND r.source_key = 'd:' || d.id
      WHERE ${where} AND r.time >= :from AND r.time < :to
      ORDER BY r.time, t.name, t.id, r.metric, r.source_key`
}

/** A backup's query for a cursor: an organization's readings (`:organizationId`), each row a JSON array in `READING_COLUMNS` order. */
export const BACKUP_READINGS_SQL = `SELECT json_build_array(r.tank_id, r.metric, r.time, r.value, r.source, r.source_key) AS row
           FROM readings r JOIN tanks t ON t.id = r.tank_id
           WHERE t.organization_id = :organizationId
             -- An older raw row (late, not yet pruned) is in the exported hours already.
             AND r.time >= (SELECT raw_kept_from FROM readings_rollup_state)
           ORDER BY r.tank_id, r.metric, r.time, r.source_key`

/** Rollup tables as the backup carries them (read and restored whole, like the other small tables). */
export const ROLLUP_BACKUP_TABLES = [
  // The hours whose raw rows retention deleted; with the raw rows kept (BACKUP_READINGS_SQL) they are
  // every reading once. The other rollups (hours still kept raw, readings_daily) are derived: restore
  // rebuilds them from these rows and the readings (triggers of migration 202612051200).
  {
    table: 'readings_hourly',
    hasId: false,
    order: 'tank_id, metric, hour',
    scope: 'tank_id IN (SELECT id FROM tanks WHERE organization_id = :organizationId) AND hour < (SELECT raw_kept_from FROM readings_rollup_state)',
    columns: { tank_id: '->tanks', metric: 'text', hour: 'time', min: 'float', max: 'float', sum: 'float', count: 'int' },
  },
] as const
