import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QUARANTINE_DAYS } from '@shared/care/livestock'
import addTankStageChangedAt from '../../server/platform/db/migrations/202612021000-add-tank-stage-changed-at'
import type { TestOrg } from '../helpers/app'
import { as, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Quarantine days count from when the tank was set to the quarantine stage (28 days,
// `common practice`), whether or not animals are in it yet.
let t: CareTestApp
let org: TestOrg
const DAY_MS = 86_400_000

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Quarantine Org')
})
afterAll(() => t.close())

const stageChangedAt = async (tankId: number) =>
  (await t.ctx.sequelize.query<{ at: Date }>('SELECT stage_changed_at AS at FROM tanks WHERE id = $1', { bind: [tankId], type: QueryTypes.SELECT }))[0]!.at
const setStageChangedAt = (tankId: number, at: Date) => t.ctx.sequelize.query('UPDATE tanks SET stage_changed_at = $2 WHERE id = $1', { bind: [tankId, at] })
const patch = (tankId: number, body: object) => t.api().patch(`/api/v1/tanks/${tankId}`).set(as(org, 'owner')).send(body)

describe('stage changed at', () => {
  it('is set when a tank is created and moves only when the stage changes', async () => {
    const tankId = await newTank(t, org, { stage: 'established' })
    const created = (await t.ctx.models.Tank.findByPk(tankId))!.createdAt
    expect(Math.abs((await stageChangedAt(tankId)).getTime() - created.getTime())).toBeLessThan(5_000)
    const old = new Date(Date.now() - 40 * DAY_MS)
    await setStageChangedAt(tankId, old)

    expect((await patch(tankId, { notes: 'New lid' })).status).toBe(200)
    expect((await stageChangedAt(tankId)).toISOString()).toBe(old.toISOString())
    expect((await patch(tankId, { stage: 'established' })).status).toBe(200)
    expect((await stageChangedAt(tankId)).toISOString()).toBe(old.toISOString())

    const before = Date.now()
    expect((await patch(tankId, { stage: 'quarantine' })).status).toBe(200)
    expect((await stageChangedAt(tankId)).getTime()).toBeGreaterThanOrEqual(before - 1000)
  })

  it('backfills existing tanks with their creation time', async () => {
    const tankId = await newTank(t, org)
    await t.ctx.sequelize.query("UPDATE tanks SET created_at = '2026-01-05T08:00:00Z' WHERE id = $1", { bind: [tankId] })
    const qi = t.ctx.sequelize.getQueryInterface()
    await addTankStageChangedAt.down(qi)
    await addTankStageChangedAt.up(qi)
    expect((await stageChangedAt(tankId)).toISOString()).toBe('2026-01-05T08:00:00.000Z')
  })
})

describe('quarantine days', () => {
  it('counts days in and days remaining from the stage change, on the tank and in Care today', async () => {
    const tankId = await newTank(t, org, { stage: 'quarantine', name: 'Holding Q7' })
    await setStageChangedAt(tankId, new Date(Date.now() - (10 * DAY_MS + 3_600_000)))
    const list = await t.api().get(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'viewer'))
    expect(list.status).toBe(200)
    // 10 days and an hour in: day index 10, 18 days (rounded up from 17 d 23 h) remaining.
    expect(list.body.quarantine).toMatchObject({ daysIn: 10, daysRemaining: 18, days: QUARANTINE_DAYS })

    const today = await t.api().get(`/api/v1/care/today?siteId=${org.siteIds[0]}`).set(as(org, 'viewer'))
    expect(today.status).toBe(200)
    const watched = today.body.watch.find((w: { tank: { id: number } }) => w.tank.id === tankId)
    expect(watched).toMatchObject({ tank: { name: 'Holding Q7' }, quarantine: { daysIn: 10, daysRemaining: 18 }, watchUntil: null })
  })

  it('is not reported for a tank out of quarantine, and a new arrival shows as a watch', async () => {
    const tankId = await newTank(t, org, { stage: 'established' })
    expect((await t.api().get(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'viewer'))).body.quarantine).toBeNull()
    let today = await t.api().get(`/api/v1/care/today?siteId=${org.siteIds[0]}`).set(as(org, 'viewer'))
    expect(today.body.watch.map((w: { tank: { id: number } }) => w.tank.id)).not.toContain(tankId)
    const added = await t.api().post(`/api/v1/tanks/${tankId}/livestock`).set(as(org, 'keeper')).send({ speciesKey: 'zebra_danio', count: 6 })
    expect(added.status, JSON.stringify(added.body)).toBe(201)
    today = await t.api().get(`/api/v1/care/today?siteId=${org.siteIds[0]}`).set(as(org, 'viewer'))
    expect(today.body.watch.find((w: { tank: { id: number } }) => w.tank.id === tankId)).toMatchObject({ quarantine: null, watchUntil: added.body.watchUntil })
  })
})
