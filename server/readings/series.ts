import { QueryTypes } from 'sequelize'
import { METRIC_KEYS, METRICS, type MetricKey } from '@shared/metrics/registry'
import type {
  LatestResponse,
  RawReading,
  ReadingSource,
  SeriesBucket,
  SeriesQuery,
  SeriesResponse,
  SeriesValues,
  SiteLatestResponse,
} from '@shared/schemas/series'
import { PROBE_TRUST, spikeIndexes } from '@shared/calibration'
import type { AppContext } from '../context'
import { perContext } from '../platform/per-context'

/**
 * Buckets are aligned to this instant (a Monday, 00:00 UTC), not to the requested range: every chart
 * of the same step then shares boundaries, hour-and-longer buckets hold whole rolled-up hours, and
 * week buckets start on Mondays.
 */
export const BUCKET_ORIGIN = '2000-01-03T00:00:00Z'
const ORIGIN_MS = Date.parse(BUCKET_ORIGIN)
const HOUR = 3600
const DAY = 24 * HOUR

/** Steps a chart axis reads well at, in seconds; past the list, weeks keep doubling. */
export const NICE_STEPS = [
  1,
  2,
  5,
  10,
  15,
  30,
  60,
  2 * 60,
  5 * 60,
  10 * 60,
  15 * 60,
  30 * 60,
  HOUR,
  2 * HOUR,
  3 * HOUR,
  6 * HOUR,
  12 * HOUR,
  DAY,
  2 * DAY,
  7 * DAY,
]

function* stepsFrom(minimumSeconds: number) {
  for (const step of NICE_STEPS) if (step >= minimumSeconds) yield step
  for (let weeks = 2; ; weeks *= 2) if (weeks * 7 * DAY >= minimumSeconds) yield weeks * 7 * DAY
}

/** How many origin-aligned buckets of `stepSeconds` touch the half-open range [from, to). */
export function bucketsTouching(from: Date, to: Date, stepSeconds: number): number {
  const stepMs = stepSeconds * 1000
  const first = Math.floor((from.getTime() - ORIGIN_MS) / stepMs)
  const last = Math.floor((to.getTime() - 1 - ORIGIN_MS) / stepMs)
  return last - first + 1
}

/** The smallest nice step giving at most `points` buckets over the range (at least `floorSeconds`). */
export function chooseBucketSeconds(from: Date, to: Date, points: number, floorSeconds = 1): number {
  const rangeSeconds = (to.getTime() - from.getTime()) / 1000
  for (const step of stepsFrom(Math.max(floorSeconds, Math.ceil(rangeSeconds / points)))) {
    if (bucketsTouching(from, to, step) <= points) return step
  }
  throw new Error('unreachable: the step list is unbounded')
}

/** Spikes among a probe's readings (test-kit values are deliberate and never spikes). */
function markSpikes(metric: MetricKey, raw: RawReading[]) {
  const trust = PROBE_TRUST[metric]
  if (!trust) return
  const probe = raw.filter((r) => r.source === 'device')
  for (const i of spikeIndexes(
    probe.map((r) => r.value),
    trust.spike,
  ))
    probe[i].spike = true
}

type Span = [from: number, to: number]
export type ReadPlan = { raw: [Span, Span]; hourly: [Span, Span]; daily: Span }
const NONE: Span = [0, 0]
const span = (from: number, to: number): Span => (from < to ? [from, to] : NONE)
const floorTo = (ms: number, unitMs: number) => ORIGIN_MS + Math.floor((ms - ORIGIN_MS) / unitMs) * unitMs
const ceilTo = (ms: number, unitMs: number) => ORIGIN_MS + Math.ceil((ms - ORIGIN_MS) / unitMs) * unitMs

/**
 * Which source answers which part of [from, to) for buckets of `stepSeconds`: whole days (steps of
 * whole days only), whole hours (steps of whole hours), raw rows for the rest. Before
 * `rolledUpBefore` every reading is in the rollups; from `rawKeptFrom` on every reading is a raw
 * row. Where an edge falls inside an hour whose raw rows are gone, that hour counts whole.
 */
export function readPlan(from: number, to: number, stepSeconds: number, state: { rolledUpBefore: number; rawKeptFrom: number }): ReadPlan {
  const { rolledUpBefore, rawKeptFrom } = state
  const hourMs = HOUR * 1000
  const dayMs = DAY * 1000
  if (stepSeconds % HOUR !== 0) return { raw: [span(from, to), NONE], hourly: [NONE, NONE], daily: NONE }
  const hourStart = from >= rawKeptFrom ? ceilTo(from, hourMs) : floorTo(from, hourMs)
  const hourEnd = to >= rolledUpBefore ? rolledUpBefore : floorTo(to, hourMs) >= rawKeptFrom ? floorTo(to, hourMs) : ceilTo(to, hourMs)
  if (hourStart >= hourEnd) return { raw: [span(from, to), NONE], hourly: [NONE, NONE], daily: NONE }
  const raw: [Span, Span] = [span(from, hourStart), span(hourEnd, to)]
  if (stepSeconds % DAY === 0) {
    const dayStart = ceilTo(hourStart, dayMs)
    const dayEnd = floorTo(hourEnd, dayMs)
    if (dayStart < dayEnd) return { raw, hourly: [span(hourStart, dayStart), span(dayEnd, hourEnd)], daily: [dayStart, dayEnd] }
  }
  return { raw, hourly: [span(hourStart, hourEnd), NONE], daily: NONE }
}

type RawRow = { time: Date; value: number; source: ReadingSource; calibrated: boolean }
// pg answers the timestamp '-infinity' (nothing pruned yet) as the number -Infinity, not a Date.
type StateRow = { rolled_up_before: Date; raw_kept_from: Date | number; raw: number | string }
type Rollups = { rolledUpBefore: number; rawKeptFrom: number }
const rollupsOf = (row: StateRow): Rollups => ({ rolledUpBefore: row.rolled_up_before.getTime(), rawKeptFrom: instantMs(row.raw_kept_from) })
const instantMs = (v: Date | number) => (typeof v === 'number' ? v : v.getTime())
type BucketRow = { bucket: Date; min: number; mean: number; max: number; count: number }
type LatestRow = { tank_id: number; metric: MetricKey; time: Date; value: number; source: ReadingSource }

/*
 * Every reading before `rolled_up_before` is in its hour and its day; raw rows are complete from
 * `raw_kept_from` on (migration 202612051200). The raw count reads at most points + 1 index entries.
 */
const rawCount = (from: string, to: string, cap: string) => `(SELECT count(*) FROM (
     SELECT 1 FROM readings
     WHERE tank_id = $1 AND metric = $2 AND time >= ${from}::timestamptz AND time < ${to}::timestamptz
     LIMIT ${cap}) capped)`
const STATE_SQL = `SELECT s.rolled_up_before, s.raw_kept_from, ${rawCount('$3', '$4', '$5')} AS raw FROM readings_rollup_state s`

// `value` is the stored (corrected) value, or with `raw` what the device sent.
const valueOf = (values: SeriesValues) => (values === 'raw' ? 'coalesce(raw_value, value)' : 'value')

const rawSql = (values: SeriesValues) => `
SELECT time, ${valueOf(values)} AS value, source, calibration_id IS NOT NULL AS calibrated FROM readings
WHERE tank_id = $1 AND metric = $2 AND time >= $3::timestamptz AND time < $4::timestamptz
ORDER BY time, source_key`

/*
 * The range is read from the coarsest source that holds each part of it: whole days from
 * readings_daily, whole hours around them from readings_hourly, and the minutes at either edge (and
 * after the last rolled-up hour) from raw rows. The parts are disjoint, so a bucket is their union.
 * The plan was made from the rollup state last seen; every row carries the state as this statement
 * saw it (and the raw count), so a plan made from a state since moved on is noticed and made again.
 */
const bucketsSql = (values: SeriesValues) => `
WITH samples AS (
  SELECT time AS t, ${valueOf(values)} AS lo, ${valueOf(values)} AS hi, ${valueOf(values)} AS total, 1 AS n FROM readings
  WHERE tank_id = $1 AND metric = $2 AND time >= $5::timestamptz AND time < $6::timestamptz
  UNION ALL
  SELECT time, ${valueOf(values)}, ${valueOf(values)}, ${valueOf(values)}, 1 FROM readings
  WHERE tank_id = $1 AND metric = $2 AND time >= $7::timestamptz AND time < $8::timestamptz
  UNION ALL
  SELECT hour, min, max, sum, count FROM readings_hourly
  WHERE tank_id = $1 AND metric = $2 AND hour >= $9::timestamptz AND hour < $10::timestamptz
  UNION ALL
  SELECT hour, min, max, sum, count FROM readings_hourly
  WHERE tank_id = $1 AND metric = $2 AND hour >= $11::timestamptz AND hour < $12::timestamptz
  UNION ALL
  SELECT day, min, max, sum, count FROM readings_daily
  WHERE tank_id = $1 AND metric = $2 AND day >= $13::timestamptz AND day < $14::timestamptz
), buckets AS (
  SELECT date_bin($3::integer * interval '1 second', t, $4::timestamptz) AS bucket,
         min(lo) AS min, sum(total) / sum(n) AS mean, max(hi) AS max, sum(n) AS count
  FROM samples
  GROUP BY bucket
)
SELECT s.rolled_up_before, s.raw_kept_from, ${rawCount('$15', '$16', '$17')} AS raw, b.*
FROM readings_rollup_state s LEFT JOIN buckets b ON true
ORDER BY b.bucket`

/*
 * One index probe per (tank, metric): the newest entry of (tank_id, metric, time) read backwards.
 * DISTINCT ON (metric) would walk every reading of the tank instead, since PostgreSQL 15 cannot
 * skip between metrics in the index.
 */
const LATEST_SQL = `
SELECT t.tank_id, m.metric, r.time, r.value, r.source
FROM unnest($1::integer[]) AS t(tank_id)
CROSS JOIN unnest($2::text[]) AS m(metric)
CROSS JOIN LATERAL (
  SELECT time, value, source FROM readings
  WHERE readings.tank_id = t.tank_id AND readings.metric = m.metric
  ORDER BY time DESC
  LIMIT 1
) r`

function latestByMetric(rows: LatestRow[]): LatestResponse {
  const out: LatestResponse = {}
  for (const row of rows) out[row.metric] = { value: row.value, time: row.time.toISOString(), source: row.source }
  return out
}

export const seriesService = perContext((ctx: AppContext) => {
  const select = <T extends object>(sql: string, bind: unknown[]) => ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT })
  // The rollup state as last read: it moves at most once an hour, and every bucket read checks it.
  let lastRollups: Rollups | null = null

  async function latestFor(tankIds: number[]): Promise<LatestRow[]> {
    if (!tankIds.length) return []
    return select<LatestRow>(LATEST_SQL, [tankIds, METRIC_KEYS])
  }

  return {
    /** Every reading when the range holds at most `points` of them, else min/mean/max per time bucket. */
    async series(tankId: number, query: Omit<SeriesQuery, 'values'> & { values?: SeriesValues }): Promise<SeriesResponse> {
      const q = { ...query, values: query.values ?? 'corrected' }
      const head = {
        metric: q.metric,
        unit: METRICS[q.metric].unit,
        from: q.from.toISOString(),
        to: q.to.toISOString(),
      }
      const range = [tankId, q.metric, q.from, q.to]
      const rawAnswer = async (): Promise<SeriesResponse> => {
        const rows = await select<RawRow>(rawSql(q.values), range)
        const raw: RawReading[] = rows.map((r) => ({
          t: r.time.toISOString(),
          value: r.value,
          source: r.source,
          ...(r.calibrated ? { calibrated: true } : {}),
        }))
        markSpikes(q.metric, raw)
        return { ...head, bucketSeconds: 0, points: [], raw }
      }
      // The raw count is known only from a statement of this request; the state may be the last one seen.
      let rollups = lastRollups
      let rawCountNow: number | null = null
      if (!rollups) {
        const [state] = await select<StateRow>(STATE_SQL, [...range, q.points + 1])
        rollups = lastRollups = rollupsOf(state)
        rawCountNow = Number(state.raw)
      }
      for (;;) {
        const rawComplete = q.from.getTime() >= rollups.rawKeptFrom
        if (rawComplete && rawCountNow !== null && rawCountNow <= q.points) return rawAnswer()
        // Where raw rows are gone, hours are the finest thing left, and they cannot be split.
        const bucketSeconds = chooseBucketSeconds(q.from, q.to, q.points, rawComplete ? 1 : HOUR)
        const parts = readPlan(q.from.getTime(), q.to.getTime(), bucketSeconds, rollups)
        const spans = [...parts.raw, ...parts.hourly, parts.daily]
        const bind = [tankId, q.metric, bucketSeconds, BUCKET_ORIGIN, ...spans.flatMap(([a, b]) => [new Date(a), new Date(b)]), q.from, q.to, q.points + 1]
        const rows = await select<StateRow & Partial<BucketRow>>(bucketsSql(q.values), bind)
        const seen = (lastRollups = rollupsOf(rows[0]))
        rawCountNow = Number(rows[0].raw)
        if (seen.rolledUpBefore !== rollups.rolledUpBefore || seen.rawKeptFrom !== rollups.rawKeptFrom) {
          rollups = seen
          continue
        }
        if (rawComplete && rawCountNow <= q.points) continue
        const points: SeriesBucket[] = (rows as BucketRow[])
          .filter((r) => r.bucket)
          .map((r) => ({ t: r.bucket.toISOString(), min: r.min, mean: r.mean, max: r.max, count: r.count }))
        return { ...head, bucketSeconds, points, raw: [] }
      }
    },

    /** Newest value of each metric the tank has ever reported. */
    async latest(tankId: number): Promise<LatestResponse> {
      return latestByMetric(await latestFor([tankId]))
    },

    /** Newest values for many tanks in one query; the caller has already scoped `tankIds` to the actor. */
    async siteLatest(tankIds: number[]): Promise<SiteLatestResponse> {
      const ids = [...new Set(tankIds)]
      const rowsByTank = new Map<number, LatestRow[]>(ids.map((id) => [id, []]))
      for (const row of await latestFor(ids)) rowsByTank.get(row.tank_id)!.push(row)
      return ids.map((tankId) => ({ tankId, metrics: latestByMetric(rowsByTank.get(tankId)!) }))
    },
  }
})
