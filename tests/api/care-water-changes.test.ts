import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { HEATER_OFF_CAUTION, UNPLUG_CAUTION } from '@shared/chemistry/water-change'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import { LABEL_CAUTION, TEMPORARY_RULE_NAME } from '../../server/care/water-changes'
import type { TestOrg } from '../helpers/app'
import { as, badFields, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Hand-worked geometry (volume of a rectangular prism, 1 L = 1000 cm³): the sample tank's
// floor is 100 × 40 cm = 4000 cm², so 4 L per cm of level. With no level reading it is taken
// to be filled to 90 % of its 50 cm height (our `common practice` assumption): 45 cm, 180 L.
// The 25 % heater-confirmation threshold is `common practice`; the temperature advice
// thresholds (1 and 2 °C) are those of shared/chemistry/water-change (`common practice`).
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Water Change Org')
  other = await t.createOrg('Other Water Org')
})
afterAll(() => t.close())

const plan = (tankId: number, body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  t.api().post(`/api/v1/tanks/${tankId}/water-changes/plan`).set(as(org, role)).send(body)
const start = (tankId: number, body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  t.api().post(`/api/v1/tanks/${tankId}/water-changes`).set(as(org, role)).send(body)
const finish = (id: number, body: object, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  t.api().post(`/api/v1/water-changes/${id}/finish`).set(as(org, role)).send(body)
const rulesNamed = async (tankId: number) =>
  ((await t.api().get(`/api/v1/tanks/${tankId}/rules`).set(as(org, 'viewer'))).body as Array<{ name: string }>).filter((r) => r.name === TEMPORARY_RULE_NAME)
const levelReading = (tankId: number, cm: number) =>
  t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ('i:care-test', 'water_level', now(), $1, $2, 'import')`,
    { bind: [tankId, cm] },
  )

describe('water-change plan', () => {
  it('plans 12 % of an assumed 45 cm fill: 21.6 L out, level 39.6 cm, heater covered', async () => {
    const tankId = await newTank(t, org)
    const res = await plan(tankId, { percent: 12, labelRate: { amount: 5, unit: 'mL', per: '10L' }, newWaterTempC: 23 }, 'viewer')
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.fillHeight).toMatchObject({ cm: 45, source: 'assumed', readingAt: null })
    expect(res.body.waterLitres).toBeCloseTo(180, 9)
    expect(res.body.litresOut).toBeCloseTo(21.6, 9)
    expect(res.body.levelAfterCm).toBeCloseTo(39.6, 9)
    expect(res.body).toMatchObject({ heaterTopCm: 30, heaterExposed: false, requiresHeaterOffConfirmation: false })
    // (45 − 30) cm × 4 L = 60 L = 33.3 % of 180 L.
    expect(res.body.maxLitresKeepingHeaterCovered).toBeCloseTo(60, 9)
    expect(res.body.maxPercentKeepingHeaterCovered).toBeCloseTo(100 / 3, 9)
    // Label rate 5 mL per 10 L, scaled to the 21.6 L of new water: 10.8 mL.
    expect(res.body.dose.amount).toBeCloseTo(10.8, 9)
    // No temperature reading: the heater's 26 °C set point; new water 3 °C colder is a warning.
    expect(res.body.temperature).toMatchObject({ tankC: 26, tankSource: 'heater_set_point', level: 'warning', differenceK: -3 })
    expect(res.body.cautions).toEqual(expect.arrayContaining([HEATER_OFF_CAUTION, UNPLUG_CAUTION, LABEL_CAUTION]))
  })

  it('uses the latest water-level reading when there is one, and says so', async () => {
    const tankId = await newTank(t, org)
    await levelReading(tankId, 40)
    const res = await plan(tankId, { percent: 25 })
    // 40 cm × 4 L = 160 L; 25 % = 40 L = 10 cm: level 30 cm, exactly at the heater top, not below it.
    expect(res.body.fillHeight).toMatchObject({ cm: 40, source: 'reading' })
    expect(res.body.litresOut).toBeCloseTo(40, 9)
    expect(res.body.levelAfterCm).toBeCloseTo(30, 9)
    expect(res.body).toMatchObject({ heaterExposed: false, requiresHeaterOffConfirmation: false })
  })

  it('refuses bad amounts with the field named', async () => {
    const tankId = await newTank(t, org)
    expect(badFields(await plan(tankId, { percent: 0 }))).toEqual(['percent'])
    expect(badFields(await plan(tankId, { percent: 101 }))).toEqual(['percent'])
    expect(badFields(await plan(tankId, { litres: -5 }))).toEqual(['litres'])
    expect(badFields(await plan(tankId, { litres: 0 }))).toEqual(['litres'])
    expect(badFields(await plan(tankId, { percent: 10, litres: 18 }))).toEqual(['percent'])
    expect(badFields(await plan(tankId, {}))).toEqual(['percent'])
    // More than the 180 L in the tank.
    expect(badFields(await plan(tankId, { litres: 500 }))).toEqual(['litres'])
    const noDimensions = await newTank(t, org, { dimensions: null, volumeLitres: 120, heater: null })
    expect(badFields(await plan(noDimensions, { percent: 10 }))).toEqual(['dimensions'])
    expect((await t.api().post(`/api/v1/tanks/${tankId}/water-changes/plan`).set(as(other, 'owner')).send({ percent: 10 })).status).toBe(404)
  })
})

describe('starting and finishing a water change', () => {
  it('requires heaterOffConfirmed above 25 %', async () => {
    const tankId = await newTank(t, org)
    // 30 % = 54 L = 13.5 cm: level 31.5 cm, heater still covered, but over the threshold.
    const refused = await start(tankId, { percent: 30 })
    expect(badFields(refused)).toEqual(['heaterOffConfirmed'])
    expect(refused.body.error.fields.heaterOffConfirmed).toContain(HEATER_OFF_CAUTION)
    expect((await start(tankId, { percent: 30, heaterOffConfirmed: true })).status).toBe(201)
  })

  it('requires heaterOffConfirmed for a small change that uncovers a high heater', async () => {
    // Heater top at 42 cm: 10 % = 18 L = 4.5 cm takes the level from 45 to 40.5 cm, below it.
    const tankId = await newTank(t, org, { heater: { watts: 200, setPointC: 26, topCm: 42 } })
    expect((await plan(tankId, { percent: 10 })).body).toMatchObject({ heaterExposed: true, requiresHeaterOffConfirmation: true })
    const refused = await start(tankId, { percent: 10, heaterOffConfirmed: false })
    expect(badFields(refused)).toEqual(['heaterOffConfirmed'])
    expect(refused.body.error.fields.heaterOffConfirmed).toMatch(/uncovers the heater/)
  })

  it('arms a temporary heater-line alarm for the change and removes it when the change finishes', async () => {
    const tankId = await newTank(t, org)
    await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
    expect(await rulesNamed(tankId)).toEqual([])
    expect((await start(tankId, { percent: 12 }, 'viewer')).status).toBe(403)
    const started = await start(tankId, { percent: 12 })
    expect(started.status, JSON.stringify(started.body)).toBe(201)
    expect(started.body).toMatchObject({ status: 'in_progress', heaterOffConfirmed: false, finishedAt: null })
    expect(started.body.plan.litresOut).toBeCloseTo(21.6, 9)
    expect(started.body.cautions).toEqual(expect.arrayContaining([HEATER_OFF_CAUTION, UNPLUG_CAUTION, LABEL_CAUTION]))
    const armed = await rulesNamed(tankId)
    expect(armed).toMatchObject([{ id: started.body.temporaryRuleId, severity: 'alarm', enabled: true, spec: { kind: 'heater_line', marginCm: 0 } }])
    expect((await start(tankId, { percent: 12 })).status).toBe(409)

    expect(badFields(await finish(started.body.id, { litresReplaced: 0 }))).toEqual(['litresReplaced'])
    expect(badFields(await finish(started.body.id, { litresReplaced: -2 }))).toEqual(['litresReplaced'])
    expect((await finish(started.body.id, { litresReplaced: 21 }, 'viewer')).status).toBe(403)
    expect((await t.api().post(`/api/v1/water-changes/${started.body.id}/finish`).set(as(other, 'owner')).send({ litresReplaced: 21 })).status).toBe(404)
    const done = await finish(started.body.id, { litresReplaced: 21, dechlorinatorMl: 10.5, newWaterTempC: 25.5 })
    expect(done.status, JSON.stringify(done.body)).toBe(200)
    // 21 L of the plan's 180 L is 11.7 %.
    expect(done.body).toMatchObject({ status: 'finished', litresReplaced: 21, temporaryRuleId: null })
    expect(done.body.logEntry).toMatchObject({
      kind: 'water_change',
      values: { litres: 21, percent: 11.7, dechlorinatorMl: 10.5, newWaterTempC: 25.5 },
      waterChangeId: started.body.id,
    })
    expect(await rulesNamed(tankId)).toEqual([])
    const tasks = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body
    expect(tasks.find((x: { kind: string }) => x.kind === 'water_change').due).toMatchObject({ status: 'later', daysUntilDue: 7 })
    expect((await finish(started.body.id, { litresReplaced: 21 })).status).toBe(409)
    const list = await t.api().get(`/api/v1/tanks/${tankId}/water-changes`).set(as(org, 'viewer'))
    expect(list.body.map((c: { status: string }) => c.status)).toEqual(['finished'])
  })

  it('arms no heater-line rule on a tank without a heater', async () => {
    const tankId = await newTank(t, org, { heater: null })
    const started = await start(tankId, { litres: 20 })
    expect(started.status).toBe(201)
    expect(started.body.temporaryRuleId).toBeNull()
  })
})
