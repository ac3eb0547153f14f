import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { buildsService } from '../../server/builds/builds'
import { as, newTank, startCareTestApp, type CareTestApp } from './care-helpers'
import type { TestOrg } from '../helpers/app'
import { localDaysAgo, PLAN_60, TANK_60 } from '../helpers/build-plan'

// Build plans and timelines over the real app; figures are worked by hand in tests/unit/build.
let t: CareTestApp
let org: TestOrg
const DAY = 86_400_000
const ZONE = 'Europe/Berlin' // the fixture's first site
let tankId: number

const kit = (tank: number, daysAgo: number, values: Record<string, number>) =>
  t
    .api()
    .post(`/api/v1/tanks/${tank}/test-kit-entries`)
    .set(as(org, 'keeper'))
    .send({
      takenAt: new Date(Date.now() - daysAgo * DAY).toISOString(),
      values: Object.entries(values).map(([metric, value]) => ({ metric, value, unit: metric === 'ph' ? 'pH' : 'mg/L' })),
    })
const tick = (tank: number, key: string, body: object = {}) => t.api().post(`/api/v1/tanks/${tank}/build/steps/${key}/done`).set(as(org, 'keeper')).send(body)

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Build Org')
  tankId = await newTank(t, org, { kind: 'planted', stage: 'empty', dimensions: TANK_60, heater: null })
})
afterAll(() => t.close())

describe('build plan', () => {
  it('is 404 before a plan is saved', async () => {
    const res = await t.api().get(`/api/v1/tanks/${tankId}/build`).set(as(org, 'viewer'))
    expect(res.status).toBe(404)
  })

  it('saves the plan, answers its figures and writes them into the tank', async () => {
    const res = await t.api().put(`/api/v1/tanks/${tankId}/build/plan`).set(as(org, 'keeper')).send(PLAN_60)
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.figures.waterLitres).toBeCloseTo(47.477, 3)
    expect(res.body.figures.substrate.layers.map((l: { bags: number | null }) => l.bags)).toEqual([null, 3, 1])
    expect(res.body.figures.weight.totalKg).toBeCloseTo(81.68, 1)
    expect(res.body.figures.conditioner).toMatchObject({ unit: 'mL' })
    expect(res.body.figures.conditioner.amount).toBeCloseTo(23.74, 2)
    // 6 × 4.5 + 6 × 3 = 45 cm of adult animals for 47.5 L: within 1 cm per litre (common practice).
    expect(res.body.figures.stocking.checks).toEqual([])
    expect(res.body.figures.stocking.load.adultCm).toBe(45)
    expect(res.body.filledOn).toBeNull()
    const tank = (await t.api().get(`/api/v1/tanks/${tankId}`).set(as(org, 'viewer'))).body
    expect(tank.substrateDepthCm).toBe(6)
    expect(tank.heater).toEqual({ watts: 75, setPointC: 26, topCm: 20 })
    expect(tank.media).toBe('Coarse sponge → Ceramic rings → Fine sponge → Carbon')
    expect(tank.lightSchedule).toEqual({ on: '11:00', off: '19:00' })
    expect(tank.targets.ph).toEqual({ min: 6.8, max: 7.2 })
  })

  it('gives the water-change planner the water above the planned substrate', async () => {
    // No level reading: the planner assumes 90 % of 36 cm = 32.4 cm; (32.4 − 6) cm × 1800 cm² = 47.52 L.
    const res = await t.api().post(`/api/v1/tanks/${tankId}/water-changes/plan`).set(as(org, 'viewer')).send({ percent: 10 })
    expect(res.status).toBe(200)
    expect(res.body.waterLitres).toBeCloseTo(47.52, 2)
  })

  it('refuses a heater above the 50 % water-change level, a bed deeper than the fill and a fill above the rim', async () => {
    const put = (plan: object) => t.api().put(`/api/v1/tanks/${tankId}/build/plan`).set(as(org, 'keeper')).send(plan)
    const heater = await put({ ...PLAN_60, heater: { ...PLAN_60.heater, topCm: 30 } })
    expect(heater.status).toBe(400)
    expect(heater.body.error.fields['heater.topCm']).toMatch(/between 6 cm .* and 20\.0 cm/)
    const deep = await put({
      ...PLAN_60,
      substrate: [
        { material: 'sand', depthCm: 20 },
        { material: 'gravel', depthCm: 20 },
      ],
    })
    expect(deep.status).toBe(400)
    expect(Object.keys(deep.body.error.fields)).toEqual(['depthCm'])
    const rim = await put({ ...PLAN_60, fillHeightCm: 40 })
    expect(rim.status).toBe(400)
    expect(Object.keys(rim.body.error.fields)).toEqual(['fillHeightCm'])
    const species = await put({ ...PLAN_60, stocking: [{ groups: [{ speciesKey: 'sea_monster', count: 1 }] }] })
    expect(species.status).toBe(400)
    // Nothing half-written: the tank keeps the saved plan's heater.
    const tank = (await t.api().get(`/api/v1/tanks/${tankId}`).set(as(org, 'viewer'))).body
    expect(tank.heater.topCm).toBe(20)
  })
})

describe('build timeline', () => {
  it('starts from the fill day: dated steps as care tasks, the stage to cycling', async () => {
    const filledOn = localDaysAgo(ZONE, 8)
    const res = await t.api().post(`/api/v1/tanks/${tankId}/build/start`).set(as(org, 'keeper')).send({ filledOn })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body).toMatchObject({ filledOn, day: 9, aboutDays: 28, cycled: false })
    expect(res.body.steps.map((s: { key: string }) => s.key)).toEqual(['conditioner', 'heater_check', 'ph', 'plants', 'cycling', 'stock_1', 'stock_2'])
    expect(res.body.steps[2]).toMatchObject({ day: 2, untilDay: 3, daily: true })
    const tasks = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body as Array<{
      title: string
      kind: string
      startsOn: string
      active: boolean
    }>
    const build = tasks.filter((task) => task.title.startsWith('Build: '))
    expect(build).toHaveLength(7)
    expect(build.find((task) => task.title.includes('Cycling tests'))).toMatchObject({ kind: 'test_kit_check', active: true })
    expect(build[0]!.startsOn).toBe(filledOn)
    // The tank was set up empty, so the usual routine starts with the first stocking (day 28).
    const routine = tasks.filter((task) => !task.title.startsWith('Build: '))
    expect(routine.map((task) => task.kind)).toEqual(['water_change', 'filter_rinse', 'media_replace', 'glass_clean', 'test_kit_check'])
    expect(new Set(routine.map((task) => task.startsOn))).toEqual(new Set([localDaysAgo(ZONE, 8 - 27)]))
    expect((await t.api().get(`/api/v1/tanks/${tankId}`).set(as(org, 'viewer'))).body.stage).toBe('cycling')
    const again = await t.api().post(`/api/v1/tanks/${tankId}/build/start`).set(as(org, 'keeper')).send({ filledOn })
    expect(again.status).toBe(409)
    const future = await t
      .api()
      .post(`/api/v1/tanks/${await newTank(t, org)}/build/start`)
      .set(as(org, 'keeper'))
      .send({ filledOn: '2020-13-01' })
    expect(future.status).toBe(400)
  })

  it('shows "build day 9 of about 28" on the wall tile', async () => {
    const wall = await t.api().get(`/api/v1/sites/${org.siteIds[0]}/wall`).set(as(org, 'viewer'))
    expect(wall.status).toBe(200)
    const tile = wall.body.tanks.find((x: { id: number }) => x.id === tankId)
    expect(tile.buildDay).toEqual({ day: 9, aboutDays: 28 })
  })

  it('ticks a step once, and marks its care task done and off', async () => {
    const res = await tick(tankId, 'conditioner', { notes: '24 mL added' })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    const step = res.body.build.steps.find((s: { key: string }) => s.key === 'conditioner')
    expect(step.doneAt).not.toBeNull()
    expect(step.notes).toBe('24 mL added')
    const task = await t.ctx.models.CareTask.findByPk(step.careTaskId)
    expect(task!.active).toBe(false)
    expect((await tick(tankId, 'conditioner')).status).toBe(409)
    expect((await tick(tankId, 'no_such_step')).status).toBe(400)
  })

  it('holds cycling until ammonia and nitrite read zero on consecutive tests, and stocking until cycled', async () => {
    expect((await tick(tankId, 'stock_1')).body.error.code).toBe('not_cycled')
    expect((await kit(tankId, 4, { ammonia: 1, nitrite: 0.5 })).status).toBe(201)
    expect((await kit(tankId, 2, { ammonia: 0, nitrite: 0.25, nitrate: 10 })).status).toBe(201)
    const early = await tick(tankId, 'cycling')
    expect(early.status).toBe(409)
    expect(early.body.error.code).toBe('not_cycled')
    await kit(tankId, 1, { ammonia: 0, nitrite: 0, nitrate: 15 })
    await kit(tankId, 0.1, { ammonia: 0, nitrite: 0, nitrate: 15 })
    const cycled = await tick(tankId, 'cycling')
    expect(cycled.status, JSON.stringify(cycled.body)).toBe(200)
    expect(cycled.body.build.cycled).toBe(true)
    expect((await t.api().get(`/api/v1/tanks/${tankId}`).set(as(org, 'viewer'))).body.stage).toBe('established')
  })

  it('stocks stage 1 with each group’s acclimation, and keeps stage 2 until stage 1 has settled', async () => {
    const res = await tick(tankId, 'stock_1', { acclimation: { bagLitres: 1, bagTempC: 24, bagPh: 7.4 } })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.livestock).toHaveLength(1)
    expect(res.body.livestock[0].entry).toMatchObject({ speciesKey: 'harlequin_rasbora', count: 6 })
    expect(res.body.livestock[0].acclimation.steps.length).toBeGreaterThan(1)
    // Stage 1 went in on build day 9, so stage 2 is re-dated to day 9 + 14 settle days = 23.
    expect(res.body.build.steps.find((s: { key: string }) => s.key === 'stock_2')).toMatchObject({ day: 23, dueOn: localDaysAgo(ZONE, -14) })
    const second = await tick(tankId, 'stock_2')
    expect(second.status).toBe(409)
    expect(second.body.error.code).toBe('settling')
    expect(second.body.error.message).toMatch(/settling until .* \(14 days\)/)
  })

  it('finishes when the last step is ticked, and offers the plan to the next tank of the same size', async () => {
    const actor: UserActor = {
      kind: 'user',
      userId: org.users.keeper.id,
      organizationId: org.organizationId,
      role: 'keeper',
      siteIds: null,
      sessionId: 'builds',
    }
    const builds = buildsService(t.ctx)
    for (const key of ['heater_check', 'ph', 'plants']) await builds.tick(actor, tankId, key, { notes: '' })
    // Stage 1 went in 15 days ago (a dated entry), so it has settled.
    await t.ctx.models.BuildStep.update({ doneAt: new Date(Date.now() - 15 * DAY) }, { where: { tankId, key: 'stock_1' } })
    const done = await builds.tick(actor, tankId, 'stock_2', { notes: '' })
    expect(done.build.finishedAt).not.toBeNull()
    expect(done.livestock[0]!.entry).toMatchObject({ speciesKey: 'cherry_shrimp', count: 6 })
    const next = await newTank(t, org, { dimensions: TANK_60 })
    const bigger = await newTank(t, org)
    const templates = await t.api().get(`/api/v1/tanks/${next}/build/templates`).set(as(org, 'viewer'))
    expect(templates.status).toBe(200)
    expect(templates.body).toHaveLength(1)
    expect(templates.body[0].tankId).toBe(tankId)
    expect(templates.body[0].plan.substrate).toHaveLength(3)
    expect((await t.api().get(`/api/v1/tanks/${bigger}/build/templates`).set(as(org, 'viewer'))).body).toEqual([])
  })
})

describe('bad input and races', () => {
  it('answers 400 or 404 with the field, never a 500', async () => {
    const put = (tank: number, plan: object) => t.api().put(`/api/v1/tanks/${tank}/build/plan`).set(as(org, 'keeper')).send(plan)
    const bare = await newTank(t, org, { dimensions: null, volumeLitres: 80, heater: null })
    const noSize = await put(bare, PLAN_60)
    expect(noSize.status).toBe(400)
    expect(Object.keys(noSize.body.error.fields)).toEqual(['dimensions'])
    // The page still opens for such a tank: no templates to offer, not an error.
    const none = await t.api().get(`/api/v1/tanks/${bare}/build/templates`).set(as(org, 'viewer'))
    expect(none.status).toBe(200)
    expect(none.body).toEqual([])
    const fresh = await newTank(t, org, { dimensions: TANK_60, heater: null })
    const unknown = await put(fresh, { ...PLAN_60, substrate: [{ material: 'moon_dust', depthCm: 2 }] })
    expect(unknown.status).toBe(400)
    expect(Object.keys(unknown.body.error.fields)).toEqual(['material'])
    const rockOnly = await put(fresh, { ...PLAN_60, hardscape: [{ kind: 'rock', label: 'no size' }] })
    expect(rockOnly.status).toBe(400)
    expect(Object.keys(rockOnly.body.error.fields)).toEqual(['hardscape.0.kg'])
    const tooMuchRock = await put(fresh, { ...PLAN_60, hardscape: [{ kind: 'rock', litres: 60 }] })
    expect(tooMuchRock.status).toBe(400)
    expect(
      (
        await t
          .api()
          .post(`/api/v1/tanks/${fresh}/build/start`)
          .set(as(org, 'keeper'))
          .send({ filledOn: localDaysAgo(ZONE, 1) })
      ).status,
    ).toBe(404)
    expect((await t.api().post(`/api/v1/tanks/${fresh}/build/steps/stock_9/done`).set(as(org, 'keeper')).send({})).status).toBe(400)
    expect(await t.ctx.models.TankBuild.count({ where: { tankId: [bare, fresh] } })).toBe(0)
  })

  it('fills once and ticks once when two requests race', async () => {
    const racer = await newTank(t, org, { dimensions: TANK_60, heater: null })
    expect((await t.api().put(`/api/v1/tanks/${racer}/build/plan`).set(as(org, 'keeper')).send(PLAN_60)).status).toBe(200)
    const start = () =>
      t
        .api()
        .post(`/api/v1/tanks/${racer}/build/start`)
        .set(as(org, 'keeper'))
        .send({ filledOn: localDaysAgo(ZONE, 1) })
    const starts = await Promise.all([start(), start()])
    expect(starts.map((r) => r.status).sort()).toEqual([200, 409])
    expect(await t.ctx.models.BuildStep.count({ where: { tankId: racer } })).toBe(7)
    const ticks = await Promise.all([tick(racer, 'conditioner'), tick(racer, 'conditioner')])
    expect(ticks.map((r) => r.status).sort()).toEqual([200, 409])
    expect(await t.ctx.models.CareLogEntry.count({ where: { tankId: racer, kind: 'task_done' } })).toBe(1)
  })
})
