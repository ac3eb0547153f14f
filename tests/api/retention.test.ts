import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { retentionCutoff, retentionService, startRetentionJob } from '../../server/readings/retention'
import { seriesService } from '../../server/readings/series'
import { seriesQuerySchema } from '@shared/schemas/series'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'
import { sleep, until } from '../helpers/wait'

const HOUR_MS = 3_600_000
// Buckets and rollup hours start at whole multiples of the step from Monday 2000-01-03 00:00 UTC.
const ORIGIN_MS = Date.UTC(2000, 0, 3)
const START = '2026-11-10T12:00:00Z'
const NOW = new Date('2026-11-20T12:30:00Z')
const MINUTES_10_DAYS = 10 * 24 * 60
const at = (ms: number) => new Date(ms).toISOString()

type Row = { tankId: number; metric: string; t: number; value: number }
type Aggregate = { min: number; max: number; sum: number; count: number }

/** Plain aggregation in JS: one entry per key, keys sorted. */
function aggregate(rows: Row[], keyOf: (r: Row) => string) {
  const groups = new Map<string, Aggregate>()
  for (const r of rows) {
    const key = keyOf(r)
    const g = groups.get(key) ?? { min: Infinity, max: -Infinity, sum: 0, count: 0 }
    groups.set(key, { min: Math.min(g.min, r.value), max: Math.max(g.max, r.value), sum: g.sum + r.value, count: g.count + 1 })
  }
  return new Map([...groups.entries()].sort(([a], [b]) => a.localeCompare(b)))
}
const hourKey = (r: Row) => `${r.tankId}|${r.metric}|${at(Math.floor(r.t / HOUR_MS) * HOUR_MS)}`
const bucketKey = (stepSeconds: number) => (r: Row) => at(ORIGIN_MS + Math.floor((r.t - ORIGIN_MS) / (stepSeconds * 1000)) * stepSeconds * 1000)

function expectSameAggregates(actual: Map<string, Aggregate>, expected: Map<string, Aggregate>) {
  expect([...actual.keys()]).toEqual([...expected.keys()])
  for (const [key, e] of expected) {
    const a = actual.get(key)!
    expect({ key, min: a.min, max: a.max, count: a.count }).toEqual({ key, min: e.min, max: e.max, count: e.count })
    expect(a.sum).toBeCloseTo(e.sum, 6)
  }
}

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number
let kitTankId: number
let original: Row[]

async function readingsNow(): Promise<Row[]> {
  const rows = await t.ctx.sequelize.query<{ tank_id: number; metric: string; time: Date; value: number }>(
    'SELECT tank_id, metric, time, value FROM readings ORDER BY tank_id, metric, time',
    { type: QueryTypes.SELECT },
  )
  return rows.map((r) => ({ tankId: r.tank_id, metric: r.metric, t: r.time.getTime(), value: r.value }))
}

async function rollups(): Promise<Map<string, Aggregate>> {
  const rows = await t.ctx.sequelize.query<{ tank_id: number; metric: string; hour: Date } & Aggregate>(
    'SELECT tank_id, metric, hour, min, max, sum, count FROM readings_hourly',
    { type: QueryTypes.SELECT },
  )
  const entries = rows.map((r) => [`${r.tank_id}|${r.metric}|${r.hour.toISOString()}`, { min: r.min, max: r.max, sum: r.sum, count: r.count }] as const)
  return new Map(entries.sort(([a], [b]) => a.localeCompare(b)))
}

const insertRow = (source: string, metric: string, time: string, tank: number, value: number) =>
  t.ctx.sequelize.query(`INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ($1, $2, $3, $4, $5, 'test_kit')`, {
    bind: [source, metric, time, tank, value],
  })

const series = (metric: string, from: string, to: string, points: number) =>
  seriesService(t.ctx).series(tankId, seriesQuerySchema.parse({ metric, from, to, points }))

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Retention Org')
  const create = async (name: string) =>
    (await t.api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send(sampleTank(org.siteIds[0], { name }))).body.id as number
  tankId = await create('Sump display')
  kitTankId = await create('Quarantine')
  await t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'd:1', 'temperature', $1::timestamptz + i * interval '1 minute' + interval '17 seconds', $2,
            25 + 1.5 * cos(i / 61.0) + (i % 11) * 0.03, 'device'
     FROM generate_series(0, $3 - 1) AS i`,
    { bind: [START, tankId, MINUTES_10_DAYS] },
  )
  await insertRow('k:1', 'ph', '2026-11-11T09:15:00Z', kitTankId, 7.2)
  await insertRow('k:2', 'ph', '2026-11-11T09:45:00Z', kitTankId, 7.6)
  await insertRow('k:3', 'nitrate', '2026-11-12T18:00:00Z', kitTankId, 15)
  await insertRow('k:4', 'ph', '2026-11-19T09:00:00Z', kitTankId, 7.0)
  original = await readingsNow()
})
afterAll(() => t.close())

describe('rollUpAndPrune', () => {
  it('cuts at the start of the hour the retention period reaches back to', () => {
    expect(retentionCutoff({ rawRetentionDays: 7, now: NOW }).toISOString()).toBe('2026-11-13T12:00:00.000Z')
  })

  it('holds every past reading in its hour already, and deletes only the raw rows before the cutoff', async () => {
    const cutoff = Date.parse('2026-11-13T12:00:00Z')
    const old = original.filter((r) => r.t < cutoff)
    // Three days of minute readings, and two kit hours (two pH readings share one hour).
    expect(old.length).toBe(3 * 24 * 60 + 3)
    // These readings are weeks older than the real clock: written into closed hours, they were merged on insert.
    expectSameAggregates(await rollups(), aggregate(original, hourKey))

    const result = await retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: 7, now: NOW })
    expect(result).toEqual({ rolledUpHours: 0, deletedRows: old.length })
    expectSameAggregates(await rollups(), aggregate(original, hourKey))
    expect((await rollups()).get(`${kitTankId}|ph|2026-11-11T09:00:00.000Z`)).toEqual({ min: 7.2, max: 7.6, sum: 7.2 + 7.6, count: 2 })
    expect(await readingsNow()).toEqual(original.filter((r) => r.t >= cutoff))
    const [state] = await t.ctx.sequelize.query<{ raw_kept_from: Date }>('SELECT raw_kept_from FROM readings_rollup_state', { type: QueryTypes.SELECT })
    expect(state.raw_kept_from.toISOString()).toBe('2026-11-13T12:00:00.000Z')
  })

  it('changes nothing when run again', async () => {
    const before = await rollups()
    const rawBefore = await readingsNow()
    expect(await retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: 7, now: NOW })).toEqual({ rolledUpHours: 0, deletedRows: 0 })
    expect(await rollups()).toEqual(before)
    expect(await readingsNow()).toEqual(rawBefore)
  })

  it('merges a back-dated reading into its already rolled-up hour, and pruning it changes nothing', async () => {
    await insertRow('k:5', 'temperature', '2026-11-11T03:20:00Z', tankId, 31)
    original.push({ tankId, metric: 'temperature', t: Date.parse('2026-11-11T03:20:00Z'), value: 31 })
    expect(await retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: 7, now: NOW })).toEqual({ rolledUpHours: 0, deletedRows: 1 })
    const hour = original.filter((r) => r.metric === 'temperature' && r.t >= Date.parse('2026-11-11T03:00:00Z') && r.t < Date.parse('2026-11-11T04:00:00Z'))
    expect(hour.length).toBe(61)
    const [[, expected]] = aggregate(hour, hourKey)
    const stored = (await rollups()).get(`${tankId}|temperature|2026-11-11T03:00:00.000Z`)!
    expect({ ...stored, sum: 0 }).toEqual({ ...expected, sum: 0 })
    expect(stored.max).toBe(31)
    expect(stored.sum).toBeCloseTo(expected.sum, 8)
  })

  it('rejects a retention period that is not above zero', async () => {
    await expect(retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: 0, now: NOW })).rejects.toThrow(/above zero/)
  })
})

describe('series across pruned and kept readings', () => {
  const temperatures = () => original.filter((r) => r.tankId === tankId && r.metric === 'temperature')

  it('answers the same buckets as over the readings before pruning, in hours or longer', async () => {
    for (const [points, step] of [
      [500, 3600],
      [5000, 3600],
      [100, 3 * 3600],
    ]) {
      // Without rollups 500 points would give 30-minute buckets; rolled-up hours cannot be split.
      const res = await series('temperature', START, NOW.toISOString(), points)
      expect(res.bucketSeconds).toBe(step)
      expect(res.points.length).toBeLessThanOrEqual(points)
      const actual = new Map(res.points.map((p) => [p.t, { min: p.min, max: p.max, sum: p.mean * p.count, count: p.count }]))
      const inRange = temperatures().filter((r) => r.t < NOW.getTime())
      expectSameAggregates(actual, aggregate(inRange, bucketKey(step)))
    }
  })

  it('answers hourly buckets, not raw rows, for a short range that is only rollups', async () => {
    const res = await series('temperature', '2026-11-11T00:00:00Z', '2026-11-11T06:00:00Z', 500)
    expect(res.bucketSeconds).toBe(3600)
    expect(res.raw).toEqual([])
    expect(res.points.map((p) => p.count)).toEqual([60, 60, 60, 61, 60, 60])
    expect(res.points[3].max).toBe(31)
  })

  it('counts a rolled-up hour whole when the range starts inside it', async () => {
    const res = await series('temperature', '2026-11-11T00:30:00Z', '2026-11-11T02:00:00Z', 500)
    expect(res.points.map((p) => [p.t, p.count])).toEqual([
      ['2026-11-11T00:00:00.000Z', 60],
      ['2026-11-11T01:00:00.000Z', 60],
    ])
  })

  it('still answers raw rows where no hour has been rolled up', async () => {
    const res = await series('temperature', '2026-11-19T00:00:00Z', '2026-11-19T02:00:00Z', 500)
    expect(res.bucketSeconds).toBe(0)
    expect(res.raw).toHaveLength(120)
  })
})

describe('startRetentionJob', () => {
  it('prunes on its timer and stops when told', async () => {
    // Every reading here is months older than 7 days before the real clock.
    const stop = startRetentionJob(t.ctx, { rawRetentionDays: 7, everyMs: 25 })
    await until(async () => (await readingsNow()).length === 0, 10_000, 50)
    stop()
    expect(await readingsNow()).toEqual([])
    await sleep(100) // let a run already under way finish
    await insertRow('k:6', 'ph', '2026-11-01T00:00:00Z', kitTankId, 6.8)
    await sleep(150)
    expect((await readingsNow()).map((r) => r.value)).toEqual([6.8])
  })
})
