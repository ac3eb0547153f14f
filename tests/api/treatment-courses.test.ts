import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { specificGravity, salinityFromSpecificGravity } from '@shared/chemistry/seawater-density'
import type { CareToday } from '@shared/schemas/care-api'
import type { PublicTreatmentCourse } from '@shared/schemas/treatment'
import type { TestOrg } from '../helpers/app'
import { as, badFields, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// A copper course as a label might state it: 1 mL per 10 L for 14 days, copper tested twice a day
// and held at 0.15–0.20 mg/L (the figures are the test's own; the product decides them for real).
const copperCourse = {
  product: 'Copper sulfate treatment (label batch 7)',
  dose: { amount: 1, unit: 'mL', perLitres: 10 },
  days: 14,
  tests: [{ metric: 'copper', timesPerDay: 2, band: { min: 0.15, max: 0.2 } }],
}

let t: CareTestApp
let org: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Treatment Org')
})
afterAll(() => t.close())

const start = (tankId: number, body: object = copperCourse, role: 'owner' | 'keeper' | 'viewer' = 'keeper') =>
  t.api().post(`/api/v1/tanks/${tankId}/treatment-courses`).set(as(org, role)).send(body)
const today = async () => {
  const res = await t.api().get('/api/v1/care/today').query({ siteId: org.siteIds[0] }).set(as(org, 'keeper'))
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body as CareToday
}
const tasksOf = (day: CareToday, tankId: number) => day.tasks.filter((task) => task.tank.id === tankId)

describe('treatment courses', () => {
  it('a keeper starts a course on a quarantine tank: its dose and tests are in Care today, and carbon and water changes get a note', async () => {
    const tankId = await newTank(t, org, { stage: 'quarantine', dimensions: null, volumeLitres: 100 })
    const res = await start(tankId)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const course = res.body as PublicTreatmentCourse
    expect(course).toMatchObject({ product: copperCourse.product, days: 14, state: 'running', day: 1, tankDose: { amount: 10, unit: 'mL', waterLitres: 100 } })
    expect(course.careTaskIds).toHaveLength(3)
    expect(course.cautions.join(' ')).toMatch(/product label/)
    expect(course.cautions.join(' ')).toMatch(/invertebrates and plants/)
    expect(course.cautions.join(' ')).toMatch(/children/)
    expect(course.cautions.join(' ')).toMatch(/aquatic veterinarian/)
    const start0 = new Date(`${course.startsOn}T00:00:00Z`)
    expect(course.endsOn).toBe(new Date(start0.getTime() + 13 * 86_400_000).toISOString().slice(0, 10))

    const tasks = tasksOf(await today(), tankId)
    const course3 = tasks.filter((task) => task.treatmentCourseId === course.id)
    expect(course3.map((task) => task.title).sort()).toEqual([
      'Dose Copper sulfate treatment (label batch 7): 10 mL for 100 L, as the label says',
      'Test copper (evening) during Copper sulfate treatment (label batch 7), label band 0.15–0.20 mg/L',
      'Test copper (morning) during Copper sulfate treatment (label batch 7), label band 0.15–0.20 mg/L',
    ])
    for (const task of course3) expect(task).toMatchObject({ endsOn: course.endsOn, due: { status: 'due_today' }, courseNote: null })
    const carbon = tasks.find((task) => task.kind === 'media_replace')
    expect(carbon?.courseNote).toMatch(/^Activated carbon removes most medications/)
    expect(carbon?.courseNote).toContain(`runs until ${course.endsOn}`)
    expect(tasks.find((task) => task.kind === 'water_change')?.courseNote).toMatch(/this 12 % change leaves 88 % of it in the water/)
    expect(tasks.find((task) => task.kind === 'glass_clean')?.courseNote).toBeNull()

    // The morning test done: due again tomorrow, so gone from today's list.
    const morning = course3.find((task) => task.title.includes('(morning)'))!
    expect(
      (
        await t
          .api()
          .post(`/api/v1/care-tasks/${morning.id}/done`)
          .set(as(org, 'keeper'))
          .send({ values: { copper: 0.17 } })
      ).status,
    ).toBe(200)
    expect(tasksOf(await today(), tankId).map((task) => task.id)).not.toContain(morning.id)

    // A second course while this one runs is refused; stopping switches its tasks off.
    const again = await start(tankId)
    expect(again.status).toBe(409)
    expect(again.body.error.fields).toHaveProperty('startsOn')
    const stopped = await t.api().post(`/api/v1/treatment-courses/${course.id}/stop`).set(as(org, 'keeper'))
    expect(stopped.status).toBe(200)
    expect(stopped.body.state).toBe('stopped')
    const after = tasksOf(await today(), tankId)
    expect(after.filter((task) => task.treatmentCourseId === course.id)).toEqual([])
    expect(after.find((task) => task.kind === 'media_replace')?.courseNote).toBeNull()
    const log = await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'keeper'))
    expect(log.body.map((e: { text: string }) => e.text)).toEqual(
      expect.arrayContaining([
        expect.stringMatching(/^Treatment course started: Copper sulfate/),
        'Treatment course stopped: Copper sulfate treatment (label batch 7)',
      ]),
    )
  })

  it('course tasks leave Care today after the last day', async () => {
    const tankId = await newTank(t, org, { stage: 'quarantine', dimensions: null, volumeLitres: 60 })
    const course = (await start(tankId, { ...copperCourse, days: 3 })).body as PublicTreatmentCourse
    expect(tasksOf(await today(), tankId).filter((task) => task.treatmentCourseId === course.id)).toHaveLength(3)
    // Move the course into the past: it ended yesterday.
    await t.ctx.sequelize.query('UPDATE treatment_courses SET starts_on = starts_on - 3, ends_on = ends_on - 3 WHERE id = $1', { bind: [course.id] })
    await t.ctx.sequelize.query('UPDATE care_tasks SET starts_on = starts_on - 3, ends_on = ends_on - 3 WHERE treatment_course_id = $1', { bind: [course.id] })
    const tasks = tasksOf(await today(), tankId)
    expect(tasks.filter((task) => task.treatmentCourseId === course.id)).toEqual([])
    expect(tasks.find((task) => task.kind === 'media_replace')?.courseNote).toBeNull()
    const listed = await t.api().get(`/api/v1/tanks/${tankId}/treatment-courses`).set(as(org, 'viewer'))
    expect(listed.body[0]).toMatchObject({ id: course.id, state: 'finished', day: null })
  })

  it('the water-change planner says how much of the medication a change leaves and the label dose for the new water', async () => {
    // 100 × 40 cm, filled to 45 cm (90 % of 50): 180 L of water.
    const tankId = await newTank(t, org, { stage: 'quarantine' })
    expect((await start(tankId)).status).toBe(201)
    const plan = await t.api().post(`/api/v1/tanks/${tankId}/water-changes/plan`).set(as(org, 'keeper')).send({ percent: 25 })
    expect(plan.status, JSON.stringify(plan.body)).toBe(200)
    expect(plan.body.treatment).toMatchObject({ product: copperCourse.product, percentLeft: 75, doseForNewWater: { amount: 4.5, unit: 'mL', litres: 45 } })
    expect(plan.body.treatment.note).toMatch(/leaves 75 % of it in the water/)
    const plain = await newTank(t, org)
    expect((await t.api().post(`/api/v1/tanks/${plain}/water-changes/plan`).set(as(org, 'keeper')).send({ percent: 25 })).body.treatment).toBeNull()
  })

  it('refuses bad input with the fields named, and viewers', async () => {
    const tankId = await newTank(t, org, { stage: 'quarantine' })
    expect(badFields(await start(tankId, { ...copperCourse, dose: { amount: 1, unit: 'mL', perLitres: 0 } }))).toEqual(['dose.perLitres'])
    expect(badFields(await start(tankId, { ...copperCourse, product: ' ' }))).toEqual(['product'])
    expect(badFields(await start(tankId, { ...copperCourse, days: 0 }))).toContain('days')
    expect(badFields(await start(tankId, { ...copperCourse, tests: [{ metric: 'copper', timesPerDay: 6 }] }))).toEqual(['tests.0.timesPerDay'])
    expect(badFields(await start(tankId, { ...copperCourse, startsOn: '2020-01-01' }))).toEqual(['startsOn'])
    expect((await start(tankId, copperCourse, 'viewer')).status).toBe(403)
    expect(await t.ctx.models.TreatmentCourse.count({ where: { tankId } })).toBe(0)
  })
})

describe('test-kit entries in the marine units', () => {
  it('stores each value in its canonical unit', async () => {
    const tankId = await newTank(t, org, { kind: 'marine' })
    const res = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/test-kit-entries`)
      .set(as(org, 'keeper'))
      .send({
        values: [
          { metric: 'temperature', value: 28, unit: 'C' },
          { metric: 'salinity', value: 35, unit: 'ppt' },
          { metric: 'specific_gravity', value: 1.025, unit: 'SG_t' },
          { metric: 'calcium', value: 10.5, unit: 'mmol/L' },
          { metric: 'magnesium', value: 54, unit: 'mmol/L' },
          { metric: 'kh', value: 2.5, unit: 'meq/L' },
          { metric: 'phosphate', value: 0.02, unit: 'mg/L PO4-P' },
          { metric: 'ammonia', value: 0.5, unit: 'mg/L NH4' },
          { metric: 'copper', value: 0.18, unit: 'mg/L' },
        ],
      })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const latest = (await t.api().get(`/api/v1/tanks/${tankId}/latest`).set(as(org, 'keeper'))).body as Record<string, { value: number; source: string }>
    expect(latest.salinity!.value).toBe(35)
    // A 25 °C hydrometer read in 28 °C water, restated at 25/25 °C (EOS-80).
    expect(latest.specific_gravity!.value).toBeCloseTo(specificGravity(salinityFromSpecificGravity(1.025, 28, 25), 25), 9)
    expect(latest.calcium!.value).toBeCloseTo(10.5 * 40.078, 9)
    expect(latest.magnesium!.value).toBeCloseTo(54 * 24.305, 9)
    expect(latest.kh!.value).toBeCloseTo(2.5 * (56.077 / 20), 9)
    expect(latest.phosphate!.value).toBeCloseTo(0.02 * (94.969762 / 30.973762), 9)
    // Ammonium kit: total ammonia as NH3 = 0.5 × 17.031 / 18.039, not 0.5.
    expect(latest.ammonia!.value).toBeCloseTo(0.5 * (17.031 / 18.039), 9)
    expect(latest.copper).toMatchObject({ value: 0.18, source: 'test_kit' })
  })

  it('refuses specific gravity at the water temperature without one, and implausible values, naming the value', async () => {
    const tankId = await newTank(t, org, { kind: 'marine' })
    const post = (values: object[]) => t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send({ values })
    const noTemp = await post([{ metric: 'specific_gravity', value: 1.025, unit: 'SG_t' }])
    expect(badFields(noTemp)).toEqual(['values.0.unit'])
    expect(noTemp.body.error.message).toMatch(/temperature/)
    expect(
      badFields(
        await post([
          { metric: 'salinity', value: 35, unit: 'PSU' },
          { metric: 'calcium', value: 2000, unit: 'mg/L' },
        ]),
      ),
    ).toEqual(['values.1.value'])
  })
})
