import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import { BUCKET_ORIGIN } from './series'
import { perContext } from '../platform/per-context'

export type RetentionOptions = { rawRetentionDays: number; now: Date }
export type RetentionResult = { rolledUpHours: number; deletedRows: number }

const HOUR_MS = 3_600_000
const DAY_MS = 24 * HOUR_MS

/**
 * Deletes one tank's raw readings older than the cutoff and folds exactly those rows into their hours,
 * in one statement: a reading inserted concurrently is either deleted and rolled up, or neither.
 *
 * The upsert merges instead of replacing: the rows it folds in are gone afterwards, so an existing
 * rollup describes other, earlier-deleted readings of the same hour (a back-dated test-kit entry
 * arriving after its hour was rolled up). Re-running finds no raw rows left and changes nothing.
 */
const ROLL_UP_AND_DELETE_SQL = `
WITH gone AS (
  DELETE FROM readings
  WHERE tank_id = $1 AND time < $2::timestamptz
  RETURNING tank_id, metric, time, value
), merged AS (
  INSERT INTO readings_hourly AS h (tank_id, metric, hour, min, max, sum, count)
  SELECT tank_id, metric, date_bin(interval '1 hour', time, $3::timestamptz),
         min(value), max(value), sum(value), count(*)
  FROM gone
  GROUP BY 1, 2, 3
  ON CONFLICT (tank_id, metric, hour) DO UPDATE SET
    min = LEAST(h.min, EXCLUDED.min),
    max = GREATEST(h.max, EXCLUDED.max),
    sum = h.sum + EXCLUDED.sum,
    count = h.count + EXCLUDED.count
  RETURNING 1
)
SELECT (SELECT count(*) FROM merged) AS hours, (SELECT count(*) FROM gone) AS deleted`

/** The start of the hour `rawRetentionDays` before `now`: everything before it is whole, old hours. */
export function retentionCutoff({ rawRetentionDays, now }: RetentionOptions): Date {
  const cutoff = now.getTime() - rawRetentionDays * DAY_MS
  return new Date(Math.floor(cutoff / HOUR_MS) * HOUR_MS)
}

export const retentionService = perContext((ctx: AppContext) => {
  return {
    async rollUpAndPrune(options: RetentionOptions): Promise<RetentionResult> {
      if (!(options.rawRetentionDays > 0)) throw new Error('rawRetentionDays must be above zero')
      const cutoff = retentionCutoff(options)
      return ctx.sequelize.transaction(async (transaction) => {
        // Per tank, so each DELETE can walk the (tank_id, metric, time) index instead of the whole table.
        const tanks = await ctx.sequelize.query<{ id: number }>('SELECT id FROM tanks ORDER BY id', {
          type: QueryTypes.SELECT,
          transaction,
        })
        const total: RetentionResult = { rolledUpHours: 0, deletedRows: 0 }
        for (const { id } of tanks) {
          const [row] = await ctx.sequelize.query<{ hours: number; deleted: number }>(ROLL_UP_AND_DELETE_SQL, {
            bind: [id, cutoff, BUCKET_ORIGIN],
            type: QueryTypes.SELECT,
            transaction,
          })
          total.rolledUpHours += row.hours
          total.deletedRows += row.deleted
        }
        return total
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
