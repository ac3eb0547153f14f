import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import type { TestOrg } from '../helpers/app'
import { as, badFields, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Several care tasks ticked off in one request: one transaction, one outcome per task.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Bulk Care Org')
  other = await t.createOrg('Other Bulk Care Org')
})
afterAll(() => t.close())

async function freshTasks() {
  const tankId = await newTank(t, org)
  const tasks = await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
  return { tankId, ids: tasks.map((task) => task.id) }
}
const logCount = async (tankId: number) => t.ctx.models.CareLogEntry.count({ where: { tankId, kind: 'task_done' } })
const tick = (role: 'owner' | 'keeper' | 'viewer', tasks: Array<{ id: number; seenLastDoneAt: string | null }>, who: TestOrg = org) =>
  t.api().post('/api/v1/care-tasks/done').set(as(who, role)).send({ tasks, notes: 'Morning round' })

describe('ticking off several care tasks at once', () => {
  it('marks each done, logs each once, and names who did it', async () => {
    const { tankId, ids } = await freshTasks()
    const res = await tick('keeper', [
      { id: ids[0]!, seenLastDoneAt: null },
      { id: ids[1]!, seenLastDoneAt: null },
    ])
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.results.map((r: { id: number; outcome: string }) => [r.id, r.outcome])).toEqual([
      [ids[0], 'done'],
      [ids[1], 'done'],
    ])
    expect(res.body.results[0].doneBy).toEqual({ id: org.users.keeper.id, name: 'keeper of Bulk Care Org' })
    expect(res.body.results[0].task.due.status).not.toBe('due_today')
    expect(await logCount(tankId)).toBe(2)
    const entries = await t.ctx.models.CareLogEntry.findAll({ where: { tankId, kind: 'task_done' }, order: [['id', 'ASC']] })
    expect(entries.map((e) => e.careTaskId)).toEqual([ids[0], ids[1]])
    expect(entries[0]!.text).toMatch(/: Morning round$/)
  })

  it('reports a task someone else ticked meanwhile as already done, without a second log entry', async () => {
    const { tankId, ids } = await freshTasks()
    // The owner's list was loaded while both were due; the keeper ticks the first one first.
    expect((await tick('keeper', [{ id: ids[0]!, seenLastDoneAt: null }])).status).toBe(200)
    const res = await tick('owner', [
      { id: ids[0]!, seenLastDoneAt: null },
      { id: ids[1]!, seenLastDoneAt: null },
    ])
    expect(res.status).toBe(200)
    expect(res.body.results.map((r: { outcome: string }) => r.outcome)).toEqual(['already_done', 'done'])
    expect(res.body.results[0].doneBy.name).toBe('keeper of Bulk Care Org')
    expect(await logCount(tankId)).toBe(2)
    const first = await t.ctx.models.CareTask.findByPk(ids[0]!)
    expect(first!.lastDoneBy).toBe(org.users.keeper.id)
  })

  it('two people ticking the same tasks at the same moment log each task once', async () => {
    const { tankId, ids } = await freshTasks()
    const same = ids.slice(0, 3).map((id) => ({ id, seenLastDoneAt: null }))
    const [a, b] = await Promise.all([tick('keeper', same), tick('owner', [...same].reverse())])
    expect([a.status, b.status]).toEqual([200, 200])
    const outcomes = [...a.body.results, ...b.body.results].map((r: { outcome: string }) => r.outcome)
    expect(outcomes.filter((o) => o === 'done')).toHaveLength(3)
    expect(outcomes.filter((o) => o === 'already_done')).toHaveLength(3)
    expect(await logCount(tankId)).toBe(3)
  })

  it('refuses the whole request, writing nothing, when one task is unknown, switched off or another organization’s', async () => {
    const { tankId, ids } = await freshTasks()
    const foreign = (await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(await newTank(t, other)))!))[0]!.id
    expect(
      (
        await tick('keeper', [
          { id: ids[0]!, seenLastDoneAt: null },
          { id: foreign, seenLastDoneAt: null },
        ])
      ).status,
    ).toBe(404)
    await t.ctx.models.CareTask.update({ active: false }, { where: { id: ids[1]! } })
    const off = await tick('keeper', [
      { id: ids[0]!, seenLastDoneAt: null },
      { id: ids[1]!, seenLastDoneAt: null },
    ])
    expect(badFields(off)).toEqual(['tasks.1.id'])
    expect(await logCount(tankId)).toBe(0)
    expect((await t.ctx.models.CareTask.findByPk(ids[0]!))!.lastDoneAt).toBeNull()
  })

  it('checks its input and its callers', async () => {
    const { ids } = await freshTasks()
    expect(badFields(await tick('keeper', []))).toEqual(['tasks'])
    expect(
      badFields(
        await tick('keeper', [
          { id: ids[0]!, seenLastDoneAt: null },
          { id: ids[0]!, seenLastDoneAt: null },
        ]),
      ),
    ).toEqual(['tasks'])
    expect(badFields(await tick('keeper', [{ id: ids[0]!, seenLastDoneAt: 'yesterday' }]))).toEqual(['tasks.0.seenLastDoneAt'])
    expect((await tick('viewer', [{ id: ids[0]!, seenLastDoneAt: null }])).status).toBe(403)
  })
})
