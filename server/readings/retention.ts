import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import { METRIC_KEYS } from '@shared/metrics/registry'
import { BUCKET_ORIGIN } from './series'
import { perContext } from '../platform/per-context'

export type RetentionOptions = { rawRetentionDays: number; now: Date }
export type RetentionResult = { rolledUpHours: number; deletedRows: number }

const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS

/*
 * Rollups hold every reading before `rolled_up_before`; raw rows are complete from `raw_kept_from` on
 * (migration 202612051200 explains the triggers that keep both true for late and deleted readings).
 * The job rolls closed hours forward, then deletes raw rows older than the raw window: those are in
 * the rollups already, so deleting them changes no rollup.
 */
const LOCK_STATE_SQL = 'SELECT rolled_up_before FROM readings_rollup_state FOR UPDATE'

/*
 * A statement whose readings are less than 30 minutes older than its transaction merges nothing into
 * the rollups (the quick path of the insert trigger). Hours ending later than 30 minutes before the
 * oldest open transaction may still receive such readings, so they wait for a later run.
 * pg_stat_activity is read once per transaction, after the state row is ours. Only client sessions
 * count: autovacuum writes no readings and may run for long.
 */
const SETTLED_BEFORE_SQL = `
SELECT least(now(), min(xact_start)) - interval '30 minutes' AS settled
FROM pg_stat_activity WHERE datname = current_database() AND backend_type = 'client backend'`

// One index range per tank and metric, over the hours being closed.
const ROLL_FORWARD_SQL = `
WITH merged AS (
  INSERT INTO readings_hourly AS h (tank_id, metric, hour, min, max, sum, count)
  SELECT t.id, m.metric, date_bin(interval '1 hour', r.time, $3::timestamptz), min(r.value), max(r.value), sum(r.value), count(*)
  FROM tanks t
  CROSS JOIN unnest($4::text[]) AS m(metric)
  CROSS JOIN LATERAL (
    SELECT time, value FROM readings
    WHERE tank_id = t.id AND metric = m.metric AND time >= $1::timestamptz AND time < $2::timestamptz
  ) r
  GROUP BY 1, 2, 3
  ON CONFLICT (tank_id, metric, hour) DO UPDATE SET
    min = LEAST(h.min, EXCLUDED.min),
    max = GREATEST(h.max, EXCLUDED.max),
    sum = h.sum + EXCLUDED.sum,
    count = h.count + EXCLUDED.count
  RETURNING 1
)
SELECT count(*) AS hours FROM merged`

const MOVE_STATE_SQL = `
UPDATE readings_rollup_state SET rolled_up_before = $1::timestamptz, raw_kept_from = GREATEST(raw_kept_from, $2::timestamptz)`

const DELETE_OLD_SQL = `
WITH gone AS (DELETE FROM readings WHERE tank_id = $1 AND time < $2::timestamptz RETURNING 1)
SELECT count(*) AS deleted FROM gone`

/** The start of the hour `rawRetentionDays` before `now`: everything before it is whole, old hours. */
export function retentionCutoff({ rawRetentionDays, now }: RetentionOptions): Date {
  const cutoff = now.getTime() - rawRetentionDays * DAY_MS
  return new Date(Math.floor(cutoff / HOUR_MS) * HOUR_MS)
}

const floorHour = (ms: number) => Math.floor(ms / HOUR_MS) * HOUR_MS

export const retentionService = perContext((ctx: AppContext) => {
  return {
    async rollUpAndPrune(options: RetentionOptions): Promise<RetentionResult> {
      if (!(options.rawRetentionDays > 0)) throw new Error('rawRetentionDays must be above zero')
      return ctx.sequelize.transaction(async (transaction) => {
        const select = <T extends object>(sql: string, bind: unknown[] = []) => ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction })
        const [state] = await select<{ rolled_up_before: Date }>(LOCK_STATE_SQL)
        const [{ settled }] = await select<{ settled: Date }>(SETTLED_BEFORE_SQL)
        const rolledBefore = state.rolled_up_before.getTime()
        const target = floorHour(Math.min(settled.getTime(), options.now.getTime() - HOUR_MS / 2))
        let rolledUpHours = 0
        if (target > rolledBefore) {
          const [row] = await select<{ hours: number }>(ROLL_FORWARD_SQL, [state.rolled_up_before, new Date(target), BUCKET_ORIGIN, METRIC_KEYS])
          rolledUpHours = row.hours
        }
        const rolledUpTo = Math.max(target, rolledBefore)
        // Never delete a raw row the rollups do not hold yet.
        const cutoff = new Date(Math.min(retentionCutoff(options).getTime(), rolledUpTo))
        await ctx.sequelize.query(MOVE_STATE_SQL, { bind: [new Date(rolledUpTo), cutoff], transaction })
        // Per tank, so each DELETE can walk the (tank_id, metric, time) index instead of the whole table.
        const tanks = await select<{ id: number }>('SELECT id FROM tanks ORDER BY id')
        let deletedRows = 0
        for (const { id } of tanks) deletedRows += (await select<{ deleted: number }>(DELETE_OLD_SQL, [id, cutoff]))[0].deleted
        return { rolledUpHours, deletedRows }
      })
    },
  }
})

/** Runs the roll-up every `everyMs` until the returned function is called; never keeps the process alive. */
export function startRetentionJob(ctx: AppContext, options: { rawRetentionDays: number; everyMs: number }) {
  const retention = retentionService(ctx)
  let running = false
  const timer = setInterval(async () => {
    if (running) return // a slow run is not overlapped by the next tick
    running = true
    try {
      const result = await retention.rollUpAndPrune({ rawRetentionDays: options.rawRetentionDays, now: new Date() })
      if (result.deletedRows) ctx.logger.info(result, 'readings rolled up and pruned')
    } catch (error) {
      ctx.logger.error({ err: error }, 'readings retention failed')
    } finally {
      running = false
    }
  }, options.everyMs)
  timer.unref()
  return () => clearInterval(timer)
}
