// Series over a year of readings read from daily and hourly rollups and raw rows, checked against a
// plain aggregation of the very rows that were written (kept in memory, since retention deletes most).
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { retentionService } from '../../server/readings/retention'
import type { SeriesResponse } from '@shared/schemas/series'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

const ORIGIN_MS = Date.UTC(2000, 0, 3)
const MINUTE = 60_000
const HOUR = 60 * MINUTE
const DAY = 24 * HOUR
const RAW_DAYS = 30
const at = (ms: number) => new Date(ms).toISOString()
const floorTo = (ms: number, unit: number) => ORIGIN_MS + Math.floor((ms - ORIGIN_MS) / unit) * unit

type Row = { t: number; value: number }
type Aggregate = { min: number; max: number; sum: number; count: number }

function aggregateBy(rows: Row[], keyOf: (t: number) => number) {
  const out = new Map<number, Aggregate>()
  for (const { t, value } of rows) {
    const key = keyOf(t)
    const a = out.get(key) ?? { min: Infinity, max: -Infinity, sum: 0, count: 0 }
    out.set(key, { min: Math.min(a.min, value), max: Math.max(a.max, value), sum: a.sum + value, count: a.count + 1 })
  }
  return new Map([...out.entries()].sort(([a], [b]) => a - b))
}

function expectPointsMatch(points: SeriesResponse['points'], rows: Row[], stepMs: number) {
  const expected = aggregateBy(rows, (t) => floorTo(t, stepMs))
  expect(points.map((p) => p.t)).toEqual([...expected.keys()].map(at))
  for (const p of points) {
    const e = expected.get(Date.parse(p.t))!
    expect({ t: p.t, min: p.min, max: p.max, count: p.count }).toEqual({ t: p.t, min: e.min, max: e.max, count: e.count })
    expect(p.mean).toBeCloseTo(e.sum / e.count, 9)
  }
}

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number
let written: Row[]
let now: number
let rawKeptFrom: number
let rolledUpBefore: number
/** Days hold the readings before the last rolled-up hour; later ones are raw rows only. */
const writtenDays = () =>
  aggregateBy(
    written.filter((r) => r.t < rolledUpBefore),
    (time) => floorTo(time, DAY),
  )

const series = async (from: number, to: number, points: number) => {
  const res = await t
    .api()
    .get(`/api/v1/tanks/${tankId}/series`)
    .query({ metric: 'ph', from: at(from), to: at(to), points })
    .set(bearer(org.users.owner.token))
  expect(res.status).toBe(200)
  return res.body as SeriesResponse
}

const insertReadings = (rows: Row[], sourceKey: string, source = 'device') =>
  t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT $1, 'ph', time, $2, value, $3 FROM unnest($4::timestamptz[], $5::float8[]) AS u(time, value)`,
    { bind: [sourceKey, tankId, source, rows.map((r) => at(r.t)), rows.map((r) => r.value)] },
  )

async function dailyRows() {
  const rows = await t.ctx.sequelize.query<{ day: Date } & Aggregate>(
    "SELECT day, min, max, sum, count FROM readings_daily WHERE tank_id = $1 AND metric = 'ph' ORDER BY day",
    { bind: [tankId], type: QueryTypes.SELECT },
  )
  return new Map(rows.map((r) => [r.day.getTime(), { min: r.min, max: r.max, sum: r.sum, count: r.count }]))
}

function expectSameDays(actual: Map<number, Aggregate>, expected: Map<number, Aggregate>) {
  expect([...actual.keys()].map(at)).toEqual([...expected.keys()].map(at))
  for (const [day, e] of expected) {
    const a = actual.get(day)!
    expect({ day: at(day), min: a.min, max: a.max, count: a.count }).toEqual({ day: at(day), min: e.min, max: e.max, count: e.count })
    expect(a.sum).toBeCloseTo(e.sum, 6)
  }
}

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Rollup Org')
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(bearer(org.users.owner.token))
    .send(sampleTank(org.siteIds[0], { name: 'Reef display' }))
  tankId = res.body.id
  // A year and a day of readings every 10 minutes up to the real clock, at odd seconds, with a wobble
  // and a few spikes, so that min, max and mean all differ from bucket to bucket.
  now = Date.now()
  const first = floorTo(now - 366 * DAY, 10 * MINUTE) + 7_000
  written = []
  for (let time = first, i = 0; time < now; time += 10 * MINUTE, i++) {
    const spike = i % 997 === 0 ? 0.8 : 0
    written.push({ t: time, value: 7 + 0.3 * Math.sin(i / 37) + ((i * 7919) % 101) / 1000 + spike })
  }
  await insertReadings(written, 'd:1')
  // What the app's hourly job does, with a 30-day raw window.
  const result = await retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: RAW_DAYS, now: new Date(now) })
  expect(result.deletedRows).toBeGreaterThan(330 * 24 * 6)
  const [state] = await t.ctx.sequelize.query<{ raw_kept_from: Date; rolled_up_before: Date }>(
    'SELECT raw_kept_from, rolled_up_before FROM readings_rollup_state',
    { type: QueryTypes.SELECT },
  )
  rawKeptFrom = state.raw_kept_from.getTime()
  rolledUpBefore = state.rolled_up_before.getTime()
  expect(rawKeptFrom).toBe(floorTo(now - RAW_DAYS * DAY, HOUR))
  // The job rolled the hours since the migration forward, up to half an hour or more before now.
  expect(state.rolled_up_before.getTime()).toBeGreaterThan(now - 2 * HOUR)
  expect(state.rolled_up_before.getTime()).toBeLessThanOrEqual(now - 30 * MINUTE)
}, 120_000)
afterAll(() => t.close())

describe('series from rollups', () => {
  const RANGES = [
    ['1 hour', HOUR],
    ['1 day', DAY],
    ['1 week', 7 * DAY],
    ['1 month', 30 * DAY],
    ['1 year', 365 * DAY],
  ] as const

  for (const [label, length] of RANGES) {
    for (const points of [1000, 500, 100]) {
      it(`answers ${label} as at most ${points} points with the envelope of a raw scan`, async () => {
        const to = now - 1234
        const from = to - length
        const res = await series(from, to, points)
        if (res.bucketSeconds === 0) {
          expect(res.raw.map((r) => [Date.parse(r.t), r.value])).toEqual(written.filter((r) => r.t >= from && r.t < to).map((r) => [r.t, r.value]))
          expect(res.raw.length).toBeLessThanOrEqual(points)
          return
        }
        expect(res.points.length).toBeLessThanOrEqual(points)
        // Before the raw window only whole hours are left: a range starting there counts its first hour whole.
        const start = from >= rawKeptFrom ? from : floorTo(from, HOUR)
        const rows = written.filter((r) => r.t >= start && r.t < to)
        expectPointsMatch(res.points, rows, res.bucketSeconds * 1000)
        expect(Math.min(...res.points.map((p) => p.min))).toBe(Math.min(...rows.map((r) => r.value)))
        expect(Math.max(...res.points.map((p) => p.max))).toBe(Math.max(...rows.map((r) => r.value)))
      })
    }
  }

  it('reads a year as whole days when the step is a day or longer', async () => {
    const res = await series(now - 365 * DAY, now, 500)
    expect(res.bucketSeconds).toBe(24 * 3600)
    expect(res.points.length).toBeLessThanOrEqual(500)
  })

  it('keeps each day equal to its readings, and a day mean equals the count-weighted mean of the raw rows', async () => {
    expectSameDays(await dailyRows(), writtenDays())
    // Ten whole days long before the raw window, as ten points: one daily row each.
    const from = floorTo(now - 200 * DAY, DAY)
    const res = await series(from, from + 10 * DAY, 10)
    expect(res.bucketSeconds).toBe(24 * 3600)
    expect(res.points).toHaveLength(10)
    for (const p of res.points) {
      const day = written.filter((r) => r.t >= Date.parse(p.t) && r.t < Date.parse(p.t) + DAY)
      expect(p.count).toBe(day.length)
      expect(p.mean).toBeCloseTo(day.reduce((sum, r) => sum + r.value, 0) / day.length, 9)
    }
  })

  it('merges a back-dated reading into its hour and day, and takes it out again when it is deleted', async () => {
    const time = floorTo(now - 10 * DAY, DAY) + 5 * HOUR + 17 * MINUTE
    const day = floorTo(time, DAY)
    await insertReadings([{ t: time, value: 9.9 }], 'k:1', 'test_kit')
    const res = await series(day, day + DAY, 24)
    expect(res.bucketSeconds).toBe(3600)
    const hour = res.points.find((p) => p.t === at(floorTo(time, HOUR)))!
    expect(hour.max).toBe(9.9)
    expect(hour.count).toBe(7)
    expect((await dailyRows()).get(day)).toMatchObject({ max: 9.9, count: 145 })

    await t.ctx.sequelize.query("DELETE FROM readings WHERE source_key = 'k:1'")
    const after = await series(day, day + DAY, 24)
    expectPointsMatch(
      after.points,
      written.filter((r) => r.t >= day && r.t < day + DAY),
      HOUR,
    )
    expectSameDays(await dailyRows(), writtenDays())
  })

  it('keeps a day true when two transactions write late readings into different hours of it at once', async () => {
    const day = floorTo(now - 12 * DAY, DAY)
    const first = { t: day + 3 * HOUR + 5 * MINUTE, value: 6.1 }
    const second = { t: day + 20 * HOUR + 5 * MINUTE, value: 8.3 }
    const insertIn = (transaction: Awaited<ReturnType<typeof t.ctx.sequelize.transaction>>, row: Row, key: string) =>
      t.ctx.sequelize.query(`INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ($1, 'ph', $2, $3, $4, 'test_kit')`, {
        bind: [key, at(row.t), tankId, row.value],
        transaction,
      })
    const one = await t.ctx.sequelize.transaction()
    const two = await t.ctx.sequelize.transaction()
    await insertIn(one, first, 'k:2')
    // The second waits for the first on the day's row, then adds to what the first committed.
    const secondDone = insertIn(two, second, 'k:3').then(() => two.commit())
    await new Promise((resolve) => setTimeout(resolve, 200))
    await one.commit()
    await secondDone
    written.push(first, second)
    expect((await dailyRows()).get(day)).toMatchObject({ min: 6.1, max: 8.3, count: 146 })
    expectSameDays(await dailyRows(), writtenDays())
  })

  // Last in the file: it prunes raw rows the tests above read.
  it('answers from the rollups as they are now after the hourly job has moved them on since the last chart', async () => {
    const to = now - 1234
    const from = now - 25 * DAY + 17 * MINUTE
    const before = await series(from, to, 1000)
    expect(before.bucketSeconds).toBe(3600)
    expectPointsMatch(
      before.points,
      written.filter((r) => r.t >= from && r.t < to),
      HOUR,
    )
    // The raw window shrinks past `from`: its first hour is now only in the rollups, and counts whole.
    await retentionService(t.ctx).rollUpAndPrune({ rawRetentionDays: 20, now: new Date(now) })
    const after = await series(from, to, 1000)
    expect(after.points[0]).toMatchObject({ t: at(floorTo(from, HOUR)), count: 6 })
    expectPointsMatch(
      after.points,
      written.filter((r) => r.t >= floorTo(from, HOUR) && r.t < to),
      HOUR,
    )
  })
})
