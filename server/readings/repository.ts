// Every read of the stored readings and their hourly rollups made outside this folder: the one
// place that knows their tables. Writes, exports and backup streams are in `repository-bulk.ts`.
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize'

export type TimedRow = { time: Date; value: number }
export type TankTimedRow = { tank_id: number; time: Date; value: number; source: 'device' | 'test_kit' | 'import' }
/** A reading with its source key: `k:<entry id>` for a test-kit entry, `d:<device id>` for a device. */
export type KitRow = { sourceKey: string; time: Date; metric: string; value: number }
export type CatchUpRow = { tank_id: number; metric: string; time: Date; value: number; source: 'device' | 'test_kit' | 'import' }

// ---- latest values -------------------------------------------------------------------------

/** The tank's newest reading of `metric` after `after`, from any source, or null. */
export async function newestReadingAfter(sequelize: Sequelize, tankId: number, metric: string, after: Date): Promise<TimedRow | null> {
  const rows = await sequelize.query<TimedRow>(`SELECT value, time FROM readings WHERE tank_id = $1 AND metric = $2 AND time > $3 ORDER BY time DESC LIMIT 1`, {
    bind: [tankId, metric, after],
    type: QueryTypes.SELECT,
  })
  return rows[0] ?? null
}

/** How many readings each source key stored since `since` (keys without readings are absent). */
export async function countsBySourceKey(sequelize: Sequelize, sourceKeys: string[], since: Date): Promise<Map<string, number>> {
  const rows = await sequelize.query<{ source_key: string; n: number }>(
    `SELECT source_key, count(*)::int AS n FROM readings
      WHERE source_key = ANY($keys) AND time >= $since GROUP BY source_key`,
    { bind: { keys: sourceKeys, since }, type: QueryTypes.SELECT },
  )
  return new Map(rows.map((r) => [r.source_key, r.n]))
}

/** Readings of these tanks stored after `after`: the newest `maxRows` of them, oldest first. */
export async function newestReadingsOfTanks(sequelize: Sequelize, tankIds: number[], after: Date, maxRows: number): Promise<CatchUpRow[]> {
  return sequelize.query<CatchUpRow>(
    `SELECT tank_id, metric, time, value, source FROM (
       SELECT tank_id, metric, time, value, source FROM readings
        WHERE tank_id = ANY($tanks) AND time > $from ORDER BY time DESC LIMIT ${Math.trunc(maxRows)}
     ) newest ORDER BY time`,
    { bind: { tanks: tankIds, from: after }, type: QueryTypes.SELECT },
  )
}

// ---- windows -------------------------------------------------------------------------------

/** One metric of several tanks between `from` and `to` (both included), by tank, then time: a rule's history. */
export async function windowOfTanks(sequelize: Sequelize, metric: string, tankIds: number[], from: Date, to: Date): Promise<TankTimedRow[]> {
  return sequelize.query<TankTimedRow>(
    `SELECT tank_id, time, value, source FROM readings WHERE metric = $1 AND tank_id = ANY($2) AND time >= $3 AND time <= $4 ORDER BY tank_id, time`,
    { bind: [metric, tankIds, from, to], type: QueryTypes.SELECT },
  )
}

/** One tank's `metric` since `since`, oldest first, at most 5000 (a mail's trend chart). */
export async function recentValues(sequelize: Sequelize, tankId: number, metric: string, since: Date, transaction?: Transaction): Promise<TimedRow[]> {
  return sequelize.query<TimedRow>(`SELECT time, value FROM readings WHERE tank_id = $1 AND metric = $2 AND time >= $3 ORDER BY time LIMIT 5000`, {
    bind: [tankId, metric, since],
    type: QueryTypes.SELECT,
    transaction,
  })
}

/**
 * Temperature of these tanks from `since` to `until`, as 15-minute means per tank (`t` the bin's
 * start, ISO), oldest first; one row per tank. A bin's mean is of its first 60 readings (one every
 * 15 s): a sensor sending far faster would otherwise make the wall read every one of them, and a
 * line this size cannot show the difference.
 */
export async function temperatureTrends(
  sequelize: Sequelize,
  tankIds: number[],
  since: Date,
  until: Date,
): Promise<Array<{ tank_id: number; trend: Array<{ t: string; value: number }> }>> {
  return sequelize.query<{ tank_id: number; trend: Array<{ t: string; value: number }> }>(
    `SELECT tank_id, json_agg(json_build_object(
              't', to_char(bin AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"'),
              'value', round(mean::numeric, 2)::float8) ORDER BY bin) AS trend
       FROM unnest($1::int[]) AS tank(tank_id)
      CROSS JOIN generate_series(date_bin('15 minutes', $2::timestamptz, TIMESTAMPTZ '2000-01-03'), $3::timestamptz, interval '15 minutes') AS bin
      CROSS JOIN LATERAL (
        SELECT avg(value) AS mean FROM (
          SELECT value FROM readings
           WHERE tank_id = tank.tank_id AND metric = 'temperature' AND time >= greatest(bin, $2::timestamptz) AND time < bin + interval '15 minutes'
           ORDER BY time LIMIT 60) firsts) bucket
      WHERE mean IS NOT NULL
      GROUP BY tank_id`,
    { bind: [tankIds, since, until], type: QueryTypes.SELECT },
  )
}

// The last reading before the period may hold into it and the first after ends its last step.
// Hours whose raw rows retention has deleted count as one reading of their mean at the half hour
// (rollups also hold the hours still kept raw: migration 202612051200).
const KEPT = '(SELECT raw_kept_from FROM readings_rollup_state)'
const PERIOD_SQL = `
(SELECT time, value FROM readings WHERE tank_id = $1 AND metric = $2 AND time < $3::timestamptz AND time >= ${KEPT} ORDER BY time DESC LIMIT 1)
UNION ALL
(SELECT time, value FROM readings WHERE tank_id = $1 AND metric = $2 AND time >= $3::timestamptz AND time < $4::timestamptz AND time >= ${KEPT})
UNION ALL
(SELECT time, value FROM readings WHERE tank_id = $1 AND metric = $2 AND time >= $4::timestamptz AND time >= ${KEPT} ORDER BY time LIMIT 1)
UNION ALL
(SELECT hour + interval '30 minutes', sum / count FROM readings_hourly
  WHERE tank_id = $1 AND metric = $2 AND hour >= $3::timestamptz - interval '1 hour' AND hour < $4::timestamptz AND hour < ${KEPT})`

/** A report period's values of one metric: raw readings, one either side, and rolled-up hours as their means. Unordered. */
export async function periodValues(sequelize: Sequelize, tankId: number, metric: string, from: Date, to: Date): Promise<TimedRow[]> {
  return sequelize.query<TimedRow>(PERIOD_SQL, {
    bind: [tankId, metric, from.toISOString(), to.toISOString()],
    type: QueryTypes.SELECT,
  })
}

// ---- test-kit rows -------------------------------------------------------------------------

/** Ammonia, nitrite and nitrate readings since `since`, oldest first. */
export async function nitrogenRows(sequelize: Sequelize, tankId: number, since: Date): Promise<KitRow[]> {
  return sequelize.query<KitRow>(
    `SELECT source_key AS "sourceKey", time, metric, value FROM readings
     WHERE tank_id = $1 AND metric IN ('ammonia', 'nitrite', 'nitrate') AND time >= $2 ORDER BY time`,
    { bind: [tankId, since], type: QueryTypes.SELECT },
  )
}

/** Test-kit readings (source key `k:…`) of these metrics between `from` and `until` (both included), oldest first. */
export async function kitRowsBetween(sequelize: Sequelize, tankId: number, metrics: string[], from: Date, until: Date): Promise<KitRow[]> {
  return sequelize.query<KitRow>(
    `SELECT source_key AS "sourceKey", time, metric, value FROM readings
     WHERE tank_id = $1 AND source_key LIKE 'k:%' AND metric = ANY($2) AND time >= $3 AND time <= $4 ORDER BY time`,
    { bind: [tankId, metrics, from, until], type: QueryTypes.SELECT },
  )
}

/** A tank's probe reading of `metric` nearest to `at`, at most `withinMs` away (a test-kit value's comparison). */
export async function nearestProbeReading(sequelize: Sequelize, tankId: number, metric: string, at: Date, withinMs: number): Promise<TimedRow | undefined> {
  const [row] = await sequelize.query<TimedRow>(
    `SELECT time, value FROM readings
     WHERE tank_id = $1 AND metric = $2 AND source = 'device' AND time BETWEEN $3::timestamptz - $4 * interval '1 millisecond' AND $3::timestamptz + $4 * interval '1 millisecond'
     ORDER BY abs(extract(epoch FROM time - $3::timestamptz)) LIMIT 1`,
    { bind: [tankId, metric, at, withinMs], type: QueryTypes.SELECT },
  )
  return row
}
