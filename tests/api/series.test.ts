import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { seriesService } from '../../server/readings/series'
import type { SeriesResponse } from '@shared/schemas/series'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

// The contract: buckets start at whole multiples of the step counted from Monday 2000-01-03 00:00 UTC.
const ORIGIN_MS = Date.UTC(2000, 0, 3)
const START = '2026-10-01T00:00:00Z'
const START_MS = Date.parse(START)
const MINUTES_30_DAYS = 30 * 24 * 60
const at = (ms: number) => new Date(ms).toISOString()

type Row = { t: number; value: number }

/** min/mean/max/count per bucket, computed the plain way in JS over [from, to). */
function naiveBuckets(rows: Row[], from: string, to: string, stepSeconds: number) {
  const stepMs = stepSeconds * 1000
  const buckets = new Map<number, { min: number; max: number; sum: number; count: number }>()
  for (const { t, value } of rows) {
    if (t < Date.parse(from) || t >= Date.parse(to)) continue
    const key = ORIGIN_MS + Math.floor((t - ORIGIN_MS) / stepMs) * stepMs
    const b = buckets.get(key) ?? { min: Infinity, max: -Infinity, sum: 0, count: 0 }
    buckets.set(key, { min: Math.min(b.min, value), max: Math.max(b.max, value), sum: b.sum + value, count: b.count + 1 })
  }
  return [...buckets.entries()].sort(([a], [b]) => a - b).map(([key, b]) => ({ t: at(key), min: b.min, mean: b.sum / b.count, max: b.max, count: b.count }))
}

function expectBucketsEqual(actual: SeriesResponse['points'], expected: ReturnType<typeof naiveBuckets>) {
  expect(actual.map((p) => p.t)).toEqual(expected.map((p) => p.t))
  expect(actual.map((p) => p.count)).toEqual(expected.map((p) => p.count))
  actual.forEach((p, i) => {
    expect(p.min).toBe(expected[i].min)
    expect(p.max).toBe(expected[i].max)
    expect(p.mean).toBeCloseTo(expected[i].mean, 9)
  })
}

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
let tankId: number
let emptyTankId: number
let foreignTankId: number
let temperature: Row[]

async function createTank(o: TestOrg, name: string) {
  const res = await t.api().post('/api/v1/tanks').set(bearer(o.users.owner.token)).send(sampleTank(o.siteIds[0], { name }))
  expect(res.status).toBe(201)
  return res.body.id as number
}

const series = (query: Record<string, string | number>, id = tankId, token = org.users.keeper.token) =>
  t.api().get(`/api/v1/tanks/${id}/series`).query(query).set(bearer(token))

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Series Org')
  other = await t.createOrg('Other Org')
  tankId = await createTank(org, 'Display')
  emptyTankId = await createTank(org, 'Empty')
  foreignTankId = await createTank(other, 'Not yours')
  // One reading a minute for 30 days, 17 s past each minute so bucket edges are not reading times.
  await t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'd:1', 'temperature', $1::timestamptz + i * interval '1 minute' + interval '17 seconds', $2,
            24 + 2 * sin(i / 97.0) + (i % 13) * 0.05, 'device'
     FROM generate_series(0, $3 - 1) AS i`,
    { bind: [START, tankId, MINUTES_30_DAYS] },
  )
  await t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES
     ('k:1', 'ph', '2026-10-02T08:00:00Z', $1, 7.4, 'test_kit'),
     ('k:2', 'ph', '2026-10-09T08:30:00Z', $1, 7.1, 'test_kit'),
     ('d:1', 'ph', '2026-10-05T12:00:00Z', $1, 7.3, 'device'),
     ('i:1', 'nitrate', '2026-09-20T10:00:00Z', $1, 20, 'import'),
     ('k:3', 'ph', '2026-10-03T09:00:00Z', $2, 6.5, 'test_kit')`,
    { bind: [tankId, foreignTankId] },
  )
  await t.ctx.sequelize.query('ANALYZE readings')
  const rows = await t.ctx.sequelize.query<{ time: Date; value: number }>(
    `SELECT time, value FROM readings WHERE tank_id = $1 AND metric = 'temperature' ORDER BY time`,
    { bind: [tankId], type: QueryTypes.SELECT },
  )
  temperature = rows.map((r) => ({ t: r.time.getTime(), value: r.value }))
})
afterAll(() => t.close())

describe('GET /tanks/:id/series in buckets', () => {
  it('folds 30 days of minute readings into 2-hour buckets that match a plain computation', async () => {
    const from = START
    const to = at(START_MS + MINUTES_30_DAYS * 60_000)
    const res = await series({ metric: 'temperature', from, to, points: 500 })
    expect(res.status).toBe(200)
    // 30 days / 500 points = 5184 s; the next nice step is 2 h, giving 360 buckets.
    expect(res.body).toMatchObject({ metric: 'temperature', unit: 'C', from: at(START_MS), to, bucketSeconds: 7200, raw: [] })
    expect(res.body.points).toHaveLength(360)
    expect(res.body.points.every((p: { count: number }) => p.count === 120)).toBe(true)
    expectBucketsEqual(res.body.points, naiveBuckets(temperature, from, to, 7200))
  })

  it('keeps partial buckets at unaligned range edges', async () => {
    const from = '2026-10-03T05:17:30Z'
    const to = '2026-10-05T11:02:00Z'
    const res = await series({ metric: 'temperature', from, to, points: 100 })
    // 193 470 s / 100 = 1935 s, so 1 h: 55 hourly buckets from 05:00 on the 3rd to 11:00 on the 5th.
    expect(res.body.bucketSeconds).toBe(3600)
    expect(res.body.points).toHaveLength(55)
    expect(res.body.points[0]).toMatchObject({ t: '2026-10-03T05:00:00.000Z', count: 42 })
    expect(res.body.points.at(-1)).toMatchObject({ t: '2026-10-05T11:00:00.000Z', count: 2 })
    expectBucketsEqual(res.body.points, naiveBuckets(temperature, from, to, 3600))
  })

  it('never answers more buckets than points, and every reading in range is in one', async () => {
    const cases: Array<[string, string, number]> = [
      ['2026-10-01T00:00:00Z', '2026-10-31T00:00:00Z', 10],
      ['2026-10-01T00:00:00Z', '2026-10-31T00:00:00Z', 5000],
      ['2026-10-04T13:13:13Z', '2026-10-19T02:02:02+02:00', 37],
      ['2026-10-10T00:00:00-05:00', '2026-10-10T23:59:00-05:00', 333],
      ['2026-09-15T00:00:00Z', '2026-10-02T00:00:00Z', 10],
    ]
    for (const [from, to, points] of cases) {
      const res = await series({ metric: 'temperature', from, to, points })
      expect(res.status).toBe(200)
      expect(res.body.bucketSeconds).toBeGreaterThan(0)
      expect(res.body.points.length).toBeLessThanOrEqual(points)
      expectBucketsEqual(res.body.points, naiveBuckets(temperature, from, to, res.body.bucketSeconds))
    }
  })

  it('switches from raw to buckets exactly when the count passes points', async () => {
    const hundred = await series({ metric: 'temperature', from: START, to: at(START_MS + 100 * 60_000), points: 100 })
    expect(hundred.body.bucketSeconds).toBe(0)
    expect(hundred.body.points).toEqual([])
    expect(hundred.body.raw).toHaveLength(100)
    expect(hundred.body.raw.slice(0, 2)).toEqual([
      { t: '2026-10-01T00:00:17.000Z', value: temperature[0].value, source: 'device' },
      { t: '2026-10-01T00:01:17.000Z', value: temperature[1].value, source: 'device' },
    ])
    expect(hundred.body.raw.map((r: { value: number }) => r.value)).toEqual(temperature.slice(0, 100).map((r) => r.value))

    const to = at(START_MS + 101 * 60_000)
    const hundredOne = await series({ metric: 'temperature', from: START, to, points: 100 })
    // 6060 s / 100 = 61 s, so 2 min: 51 buckets of two readings, the last of one.
    expect(hundredOne.body.bucketSeconds).toBe(120)
    expect(hundredOne.body.raw).toEqual([])
    expect(hundredOne.body.points).toHaveLength(51)
    expect(hundredOne.body.points.at(-1).count).toBe(1)
    expectBucketsEqual(hundredOne.body.points, naiveBuckets(temperature, START, to, 120))
  })

  it('lists raw readings of mixed sources in time order, the end of the range excluded', async () => {
    const res = await series({ metric: 'ph', from: '2026-10-02T08:00:00Z', to: '2026-10-09T08:30:00Z' })
    expect(res.body).toMatchObject({ metric: 'ph', unit: 'pH', bucketSeconds: 0, points: [] })
    expect(res.body.raw).toEqual([
      { t: '2026-10-02T08:00:00.000Z', value: 7.4, source: 'test_kit' },
      { t: '2026-10-05T12:00:00.000Z', value: 7.3, source: 'device' },
    ])
  })

  it('defaults to the 24 hours before now', async () => {
    const before = Date.now()
    const res = await series({ metric: 'temperature' })
    expect(res.status).toBe(200)
    const to = Date.parse(res.body.to)
    expect(to).toBeGreaterThanOrEqual(before - 1000)
    expect(to - Date.parse(res.body.from)).toBe(24 * 3_600_000)
    expect(res.body).toMatchObject({ bucketSeconds: 0, raw: [], points: [] })
    const toOnly = await series({ metric: 'temperature', to: '2026-10-02T00:00:00Z', points: 5000 })
    expect(toOnly.body.from).toBe('2026-10-01T00:00:00.000Z')
    expect(toOnly.body.raw).toHaveLength(1440)
  })
})

describe('series validation and scoping', () => {
  it.each([
    [{ metric: 'turbidity' }, 'metric'],
    [{}, 'metric'],
    [{ metric: 'ph', from: '2026-10-05T00:00:00Z', to: '2026-10-04T00:00:00Z' }, 'from'],
    [{ metric: 'ph', from: '2026-10-05T00:00:00Z', to: '2026-10-05T00:00:00Z' }, 'from'],
    [{ metric: 'ph', from: '2025-01-01T00:00:00Z', to: '2026-02-05T00:00:01Z' }, 'from'],
    [{ metric: 'ph', from: '2026-10-05T00:00:00' }, 'from'],
    [{ metric: 'ph', to: 'yesterday' }, 'to'],
    [{ metric: 'ph', points: 9 }, 'points'],
    [{ metric: 'ph', points: 5001 }, 'points'],
    [{ metric: 'ph', points: 'many' }, 'points'],
    [{ metric: 'ph', points: 12.5 }, 'points'],
  ])('answers 400 naming the field for %j', async (query, field) => {
    const res = await series(query as Record<string, string | number>)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(Object.keys(res.body.error.fields)).toContain(field)
  })

  it('accepts exactly 400 days and the points limits', async () => {
    const longest = await series({ metric: 'ph', from: '2025-01-01T00:00:00Z', to: '2026-02-05T00:00:00Z', points: 10 })
    expect(longest.status).toBe(200)
    expect((await series({ metric: 'ph', points: 5000 })).status).toBe(200)
  })

  it("answers 404 for another organization's tank and an unknown one, 401 without a token", async () => {
    for (const path of [`/api/v1/tanks/${foreignTankId}/series?metric=ph`, `/api/v1/tanks/${foreignTankId}/latest`]) {
      const res = await t.api().get(path).set(bearer(org.users.owner.token))
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
      expect(JSON.stringify(res.body)).not.toContain('6.5')
    }
    expect((await series({ metric: 'ph' }, 999_999)).status).toBe(404)
    expect((await t.api().get(`/api/v1/tanks/${tankId}/latest`)).status).toBe(401)
  })

  it('lets a viewer read', async () => {
    const res = await series({ metric: 'ph', from: '2026-10-01T00:00:00Z', to: '2026-10-10T00:00:00Z' }, tankId, org.users.viewer.token)
    expect(res.status).toBe(200)
    expect(res.body.raw).toHaveLength(3)
    const latest = await t.api().get(`/api/v1/tanks/${tankId}/latest`).set(bearer(org.users.viewer.token))
    expect(latest.status).toBe(200)
  })
})

describe('latest readings', () => {
  it('answers the newest value of each metric the tank has, whatever its source', async () => {
    const res = await t.api().get(`/api/v1/tanks/${tankId}/latest`).set(bearer(org.users.keeper.token))
    expect(res.status).toBe(200)
    const last = temperature.at(-1)!
    expect(res.body).toEqual({
      temperature: { value: last.value, time: '2026-10-30T23:59:17.000Z', source: 'device' },
      ph: { value: 7.1, time: '2026-10-09T08:30:00.000Z', source: 'test_kit' },
      nitrate: { value: 20, time: '2026-09-20T10:00:00.000Z', source: 'import' },
    })
    const empty = await t.api().get(`/api/v1/tanks/${emptyTankId}/latest`).set(bearer(org.users.keeper.token))
    expect(empty.body).toEqual({})
  })

  it('answers every asked tank in one call for the wall, in the order asked', async () => {
    const wall = await seriesService(t.ctx).siteLatest([emptyTankId, foreignTankId, tankId])
    expect(wall.map((w) => w.tankId)).toEqual([emptyTankId, foreignTankId, tankId])
    expect(wall[0].metrics).toEqual({})
    expect(wall[1].metrics).toEqual({ ph: { value: 6.5, time: '2026-10-03T09:00:00.000Z', source: 'test_kit' } })
    expect(Object.keys(wall[2].metrics).sort()).toEqual(['nitrate', 'ph', 'temperature'])
    expect(wall[2].metrics.ph?.value).toBe(7.1)
    expect(await seriesService(t.ctx).siteLatest([])).toEqual([])
  })
})

describe("the app's database connections", () => {
  it('run without JIT compilation, which cost a wall answer 100 ms or more to save a millisecond', async () => {
    // Every connection of the pool: hold several at once so new ones are opened, not one reused.
    const answers = await Promise.all(
      Array.from({ length: 4 }, () =>
        t.ctx.sequelize.transaction((transaction) => t.ctx.sequelize.query<{ jit: string }>('SHOW jit', { type: QueryTypes.SELECT, transaction })),
      ),
    )
    expect(answers.map(([row]) => row!.jit)).toEqual(['off', 'off', 'off', 'off'])
  })
})
