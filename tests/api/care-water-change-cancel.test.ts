import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { UNPLUG_CAUTION } from '@shared/chemistry/water-change'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import { CANCEL_CAUTION, TEMPORARY_RULE_NAME } from '../../server/care/water-changes'
import type { TestOrg } from '../helpers/app'
import { as, badFields, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Calling off a started water change: the heater-line rule that the start armed goes away,
// a care-log note says the change was cancelled, and the water-change task stays due.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Cancel Org')
  other = await t.createOrg('Other Cancel Org')
})
afterAll(() => t.close())

const start = (tankId: number, body: object) => t.api().post(`/api/v1/tanks/${tankId}/water-changes`).set(as(org, 'keeper')).send(body)
const cancel = (id: number, body: object, who = as(org, 'keeper')) => t.api().post(`/api/v1/water-changes/${id}/cancel`).set(who).send(body)
const rulesNamed = async (tankId: number) =>
  ((await t.api().get(`/api/v1/tanks/${tankId}/rules`).set(as(org, 'viewer'))).body as Array<{ id: number; name: string }>).filter(
    (r) => r.name === TEMPORARY_RULE_NAME,
  )

describe('cancelling a water change', () => {
  it('disarms the heater-line rule, logs the cancellation and leaves the task due', async () => {
    const tankId = await newTank(t, org)
    await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
    const tasksBefore = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body
    const dueBefore = tasksBefore.find((x: { kind: string }) => x.kind === 'water_change').due
    const started = await start(tankId, { percent: 12 })
    expect(started.status, JSON.stringify(started.body)).toBe(201)
    expect(await rulesNamed(tankId)).toHaveLength(1)

    expect((await cancel(started.body.id, {}, as(org, 'viewer'))).status).toBe(403)
    expect((await cancel(started.body.id, {}, as(other, 'owner'))).status).toBe(404)
    expect(badFields(await cancel(started.body.id, { reason: 'x'.repeat(301) }))).toEqual(['reason'])
    expect(badFields(await cancel(started.body.id, { reason: 42 }))).toEqual(['reason'])

    const res = await cancel(started.body.id, { reason: 'Bucket cracked' })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body).toMatchObject({
      status: 'cancelled',
      cancelReason: 'Bucket cracked',
      cancelledBy: org.users.keeper.id,
      finishedAt: null,
      temporaryRuleId: null,
      litresReplaced: null,
    })
    expect(res.body.cautions).toEqual([CANCEL_CAUTION, UNPLUG_CAUTION])
    expect(res.body.logEntry).toMatchObject({ kind: 'note', text: 'Water change cancelled (not done): Bucket cracked', waterChangeId: started.body.id })
    expect(await rulesNamed(tankId)).toEqual([])
    const rule = await t.ctx.models.WatchRule.findByPk(started.body.temporaryRuleId)
    expect(rule).toBeNull()

    const log = (await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))).body as Array<{ kind: string; text: string }>
    expect(log.map((e) => e.kind)).toEqual(['note'])
    const tasksAfter = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body
    const waterTask = tasksAfter.find((x: { kind: string }) => x.kind === 'water_change')
    expect(waterTask.lastDoneAt).toBeNull()
    expect(waterTask.due).toEqual(dueBefore)

    // Cancelled is final: neither a second cancel nor a finish.
    expect((await cancel(started.body.id, {})).status).toBe(409)
    const finish = await t.api().post(`/api/v1/water-changes/${started.body.id}/finish`).set(as(org, 'keeper')).send({ litresReplaced: 10 })
    expect(finish.status).toBe(409)
    expect(finish.body.error.message).toContain('cancelled')
    const list = (await t.api().get(`/api/v1/tanks/${tankId}/water-changes`).set(as(org, 'viewer'))).body
    expect(list.map((c: { status: string }) => c.status)).toEqual(['cancelled'])
  })

  it('frees the tank for a new change and needs no reason', async () => {
    const tankId = await newTank(t, org)
    const first = await start(tankId, { percent: 10 })
    const res = await cancel(first.body.id, {})
    expect(res.status).toBe(200)
    expect(res.body.logEntry.text).toBe('Water change cancelled (not done)')
    const second = await start(tankId, { percent: 10 })
    expect(second.status, JSON.stringify(second.body)).toBe(201)
    expect(await rulesNamed(tankId)).toMatchObject([{ id: second.body.temporaryRuleId }])
  })

  it('refuses an unknown change and a bad id', async () => {
    expect((await cancel(999999, {})).status).toBe(404)
    expect(badFields(await cancel(0 as number, {}))).toEqual(['id'])
  })
})
