import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import type { TestOrg } from '../helpers/app'
import { as, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// A phone that lost the answer sends the same entry again with the id it made: the second send
// must answer as the first did and store nothing more.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Repeated sends org')
  other = await t.createOrg('Other org')
})
afterAll(() => t.close())

const rows = async (sql: string, bind: unknown[]) => (await t.ctx.sequelize.query(sql, { bind, plain: false, raw: true }))[0] as Array<Record<string, unknown>>
const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString()

describe('a test-kit entry sent twice', () => {
  it('answers 201 with the same body both times, one entry and one set of readings', async () => {
    const tankId = await newTank(t, org)
    const clientId = randomUUID()
    const body = { clientId, takenAt: minutesAgo(90), values: [{ metric: 'nitrate', value: 20, unit: 'mg/L' }], notes: 'after feeding' }
    const first = await t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    const again = await t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    expect(again.status).toBe(201)
    expect(again.body).toEqual(first.body)
    expect(first.body.takenAt).toBe(body.takenAt)
    expect(await rows('SELECT id FROM test_kit_entries WHERE client_id = $1', [clientId])).toHaveLength(1)
    expect(await rows(`SELECT value FROM readings WHERE tank_id = $1 AND source = 'test_kit'`, [tankId])).toEqual([{ value: 20 }])
  })

  it('stores once when both sends arrive together', async () => {
    const tankId = await newTank(t, org)
    const body = { clientId: randomUUID(), values: [{ metric: 'ph', value: 7.2, unit: 'pH' }] }
    const send = () => t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    const [a, b] = await Promise.all([send(), send()])
    expect([a.status, b.status]).toEqual([201, 201])
    expect(a.body.id).toBe(b.body.id)
    expect(await rows('SELECT id FROM test_kit_entries WHERE tank_id = $1', [tankId])).toHaveLength(1)
  })

  it('refuses the id on another tank (409), and another organization using the same id stores its own', async () => {
    const [tankA, tankB] = [await newTank(t, org), await newTank(t, org)]
    const body = { clientId: randomUUID(), values: [{ metric: 'ph', value: 7.0, unit: 'pH' }] }
    expect((await t.api().post(`/api/v1/tanks/${tankA}/test-kit-entries`).set(as(org, 'keeper')).send(body)).status).toBe(201)
    const reused = await t.api().post(`/api/v1/tanks/${tankB}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    expect(reused.status).toBe(409)
    expect(reused.body.error.code).toBe('client_id_reused')
    const otherTank = await newTank(t, other)
    expect((await t.api().post(`/api/v1/tanks/${otherTank}/test-kit-entries`).set(as(other, 'keeper')).send(body)).status).toBe(201)
  })

  it('checks the phone time against the reading clock limits and refuses a value out of the plausible range', async () => {
    const tankId = await newTank(t, org)
    const post = (body: object) => t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    const ahead = await post({
      clientId: randomUUID(),
      takenAt: new Date(Date.now() + 3600_000).toISOString(),
      values: [{ metric: 'ph', value: 7, unit: 'pH' }],
    })
    expect(ahead.status).toBe(400)
    expect(ahead.body.error.message).toMatch(/in the future/)
    const implausible = await post({ clientId: randomUUID(), values: [{ metric: 'ph', value: 19, unit: 'pH' }] })
    expect(implausible.status).toBe(400)
    expect(implausible.body.error.fields).toHaveProperty(['values.0.value'])
    expect(await rows('SELECT id FROM test_kit_entries WHERE tank_id = $1', [tankId])).toHaveLength(0)
    expect((await post({ clientId: 'not-a-uuid', values: [{ metric: 'ph', value: 7, unit: 'pH' }] })).body.error.fields).toHaveProperty('clientId')
  })
})

describe('a test-kit entry for an archived tank', () => {
  it('is refused with 409 and nothing stored, while a repeat of an entry sent before archiving still answers as the first time', async () => {
    const tankId = await newTank(t, org)
    const post = (body: object) => t.api().post(`/api/v1/tanks/${tankId}/test-kit-entries`).set(as(org, 'keeper')).send(body)
    const before = { clientId: randomUUID(), values: [{ metric: 'ph', value: 7.1, unit: 'pH' }] }
    const first = await post(before)
    expect(first.status).toBe(201)
    expect((await t.api().post(`/api/v1/tanks/${tankId}/archive`).set(as(org, 'owner'))).status).toBe(200)
    const late = await post({ clientId: randomUUID(), values: [{ metric: 'ph', value: 7.3, unit: 'pH' }] })
    expect(late.status).toBe(409)
    expect(late.body.error.code).toBe('tank_archived')
    expect(late.body.error.message).toMatch(/archived/)
    const repeat = await post(before)
    expect([repeat.status, repeat.body.id]).toEqual([201, first.body.id])
    expect(await rows('SELECT id FROM test_kit_entries WHERE tank_id = $1', [tankId])).toHaveLength(1)
  })
})

describe('a care-log note sent twice', () => {
  it('answers 201 with the same body both times and logs once', async () => {
    const tankId = await newTank(t, org)
    const body = { clientId: randomUUID(), kind: 'note', text: 'Snail eggs on the glass', at: minutesAgo(30) }
    const first = await t.api().post(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'keeper')).send(body)
    const again = await t.api().post(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'keeper')).send(body)
    expect(first.status, JSON.stringify(first.body)).toBe(201)
    expect(again.status).toBe(201)
    expect(again.body).toEqual(first.body)
    expect(first.body.at).toBe(body.at)
    expect(await rows('SELECT text FROM care_log WHERE tank_id = $1', [tankId])).toEqual([{ text: 'Snail eggs on the glass' }])
  })

  it('refuses a time older than the reading age limit', async () => {
    const tankId = await newTank(t, org)
    const old = new Date(Date.now() - (t.ctx.config.readingLimits.maxAgeDays + 1) * 86_400_000).toISOString()
    const res = await t.api().post(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'keeper')).send({ clientId: randomUUID(), kind: 'note', text: 'x', at: old })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('at')
  })
})

describe('a care task ticked twice', () => {
  async function taskOn(tankId: number) {
    await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
    const tasks = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'keeper'))).body as Array<{ id: number; lastDoneAt: string | null }>
    return tasks[0]!
  }

  it('answers 200 with the same log entry both times and logs once', async () => {
    const tankId = await newTank(t, org)
    const task = await taskOn(tankId)
    const body = { clientId: randomUUID(), at: minutesAgo(45), seenLastDoneAt: null }
    const first = await t.api().post(`/api/v1/care-tasks/${task.id}/done`).set(as(org, 'keeper')).send(body)
    const again = await t.api().post(`/api/v1/care-tasks/${task.id}/done`).set(as(org, 'keeper')).send(body)
    expect(first.status, JSON.stringify(first.body)).toBe(200)
    expect(again.status).toBe(200)
    expect(again.body.logEntry).toEqual(first.body.logEntry)
    expect(again.body.task.lastDoneAt).toBe(body.at)
    expect(await rows(`SELECT id FROM care_log WHERE care_task_id = $1`, [task.id])).toHaveLength(1)
  })

  it('answers 409 already_done when someone else ticked it after the phone looked, and logs nothing more', async () => {
    const tankId = await newTank(t, org)
    const task = await taskOn(tankId)
    const seen = task.lastDoneAt
    expect((await t.api().post(`/api/v1/care-tasks/${task.id}/done`).set(as(org, 'owner')).send({})).status).toBe(200)
    const late = await t
      .api()
      .post(`/api/v1/care-tasks/${task.id}/done`)
      .set(as(org, 'keeper'))
      .send({ clientId: randomUUID(), at: minutesAgo(10), seenLastDoneAt: seen })
    expect(late.status).toBe(409)
    expect(late.body.error.code).toBe('already_done')
    expect(late.body.error.message).toBe('Already done by owner of Repeated sends org since you looked')
    expect(await rows(`SELECT id FROM care_log WHERE care_task_id = $1`, [task.id])).toHaveLength(1)
  })
})
