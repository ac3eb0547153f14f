// The migration that makes rollups cover every closed hour fills them from the readings already stored.
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import addDailyRollups from '../../server/platform/db/migrations/202612051200-add-daily-rollups'
import { bearer, sampleTank, startTestApp } from '../helpers/app'

const HOUR = 3_600_000
const DAY = 24 * HOUR
const floorTo = (ms: number, unit: number) => Math.floor(ms / unit) * unit
type Aggregate = { min: number; max: number; sum: number; count: number }

let t: Awaited<ReturnType<typeof startTestApp>>
let tankId: number
const select = <T extends object>(sql: string, bind: unknown[] = []) => t.ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT })

async function table(name: 'readings_hourly' | 'readings_daily', column: 'hour' | 'day') {
  const rows = await select<{ at: Date } & Aggregate>(`SELECT ${column} AS at, min, max, sum, count FROM ${name} WHERE tank_id = $1 ORDER BY 1`, [tankId])
  return rows.map((r) => ({ at: r.at.toISOString(), min: r.min, max: r.max, count: r.count, sum: Math.round(r.sum * 1e6) / 1e6 }))
}

function aggregate(rows: Array<{ t: number; value: number }>, unit: number) {
  const out = new Map<number, Aggregate>()
  for (const { t: time, value } of rows) {
    const key = floorTo(time, unit)
    const a = out.get(key) ?? { min: Infinity, max: -Infinity, sum: 0, count: 0 }
    out.set(key, { min: Math.min(a.min, value), max: Math.max(a.max, value), sum: a.sum + value, count: a.count + 1 })
  }
  return [...out.entries()]
    .sort(([a], [b]) => a - b)
    .map(([at, a]) => ({ at: new Date(at).toISOString(), min: a.min, max: a.max, count: a.count, sum: Math.round(a.sum * 1e6) / 1e6 }))
}

beforeAll(async () => {
  t = await startTestApp()
  const org = await t.createOrg('Migration Org')
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(bearer(org.users.owner.token))
    .send(sampleTank(org.siteIds[0], { name: 'Frag tank' }))
  tankId = res.body.id
})
afterAll(() => t.close())

describe('the daily rollups migration', () => {
  it('rolls up every stored reading of a closed hour into hours and days, keeping the hours of pruned readings', async () => {
    const qi = t.ctx.sequelize.getQueryInterface()
    await addDailyRollups.down(qi)
    // As retention left things before: one hour of pruned readings, raw rows from later on.
    const now = Date.now()
    const prunedHour = floorTo(now - 5 * DAY, HOUR)
    await t.ctx.sequelize.query(`INSERT INTO readings_hourly (tank_id, metric, hour, min, max, sum, count) VALUES ($1, 'ph', $2, 6.9, 7.4, 429, 60)`, {
      bind: [tankId, new Date(prunedHour)],
    })
    const raw: Array<{ t: number; value: number }> = []
    for (let time = floorTo(now - 3 * DAY, HOUR) + 90_000, i = 0; time < now; time += 10 * 60_000, i++) raw.push({ t: time, value: 7 + ((i * 37) % 23) / 100 })
    await t.ctx.sequelize.query(
      `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
       SELECT 'd:1', 'ph', time, $1, value, 'device' FROM unnest($2::timestamptz[], $3::float8[]) AS u(time, value)`,
      { bind: [tankId, raw.map((r) => new Date(r.t).toISOString()), raw.map((r) => r.value)] },
    )

    await addDailyRollups.up(qi)
    const [state] = await select<{ rolled_up_before: Date; raw_kept_from: Date }>('SELECT rolled_up_before, raw_kept_from FROM readings_rollup_state')
    expect(state.raw_kept_from.getTime()).toBe(prunedHour + HOUR)
    const rolledUpBefore = state.rolled_up_before.getTime()
    expect(rolledUpBefore % HOUR).toBe(0)
    expect(rolledUpBefore).toBeGreaterThan(now - 2 * HOUR)
    expect(rolledUpBefore).toBeLessThanOrEqual(now - 30 * 60_000)

    const pruned = { at: new Date(prunedHour).toISOString(), min: 6.9, max: 7.4, count: 60, sum: 429 }
    const closed = raw.filter((r) => r.t < rolledUpBefore)
    expect(await table('readings_hourly', 'hour')).toEqual([pruned, ...aggregate(closed, HOUR)])
    const prunedDay = { ...pruned, at: new Date(floorTo(prunedHour, DAY)).toISOString() }
    expect(await table('readings_daily', 'day')).toEqual([prunedDay, ...aggregate(closed, DAY)])
    expect((await select<{ n: number }>('SELECT count(*)::int AS n FROM readings'))[0].n).toBe(raw.length)

    // Down again leaves the hours of pruned readings only, as before.
    await addDailyRollups.down(qi)
    expect(await table('readings_hourly', 'hour')).toEqual([pruned])
    await addDailyRollups.up(qi)
  })
})
