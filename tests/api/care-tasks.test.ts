import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { careTasksService, createDefaultCareTasks } from '../../server/care/care-tasks'
import type { TestOrg } from '../helpers/app'
import { as, badFields, isoDaysAgo, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Intervals of the default tasks are `common practice` (see shared/care/defaults.ts); the
// Berlin and New York offsets follow Directive 2000/84/EC and 15 U.S.C. § 260a (see
// tests/unit/roster/sources.ts).
let t: CareTestApp
let org: TestOrg
let other: TestOrg
const DAY = 86_400_000

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Care Tasks Org')
  other = await t.createOrg('Other Care Org')
})
afterAll(() => t.close())

async function tankWithDefaults(siteId = org.siteIds[0] as number) {
  const tankId = await newTank(t, org, {}, siteId)
  await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
  return tankId
}
type TaskRow = { id: number; kind: string; recurrence: { everyDays?: number }; due: { status: string }; defaultValues: unknown }
const tasksOf = async (tankId: number) => (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body as TaskRow[]
const setLastDone = (taskId: number, at: Date | null) => t.ctx.models.CareTask.update({ lastDoneAt: at }, { where: { id: taskId } })
const actorFor = (role: 'owner' | 'keeper'): UserActor => ({
  kind: 'user',
  userId: org.users[role].id,
  organizationId: org.organizationId,
  role,
  siteIds: null,
  sessionId: 'test',
})

describe('care tasks of a tank', () => {
  it('creates the default routine, due on the day it was created', async () => {
    const tasks = await tasksOf(await tankWithDefaults())
    expect(tasks.map((x) => [x.kind, x.recurrence.everyDays, x.due.status])).toEqual([
      ['water_change', 7, 'due_today'],
      ['filter_rinse', 14, 'due_today'],
      ['media_replace', 42, 'due_today'],
      ['glass_clean', 7, 'due_today'],
      ['test_kit_check', 7, 'due_today'],
    ])
    expect(tasks[0]?.defaultValues).toEqual({ percent: 12 })
  })

  it('lets the owner create and change tasks; keepers and viewers may not; other organizations see nothing', async () => {
    const tankId = await newTank(t, org)
    const body = { kind: 'substrate_clean', recurrence: { kind: 'weekdays', weekdays: [3, 0] } }
    expect((await t.api().post(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'keeper')).send(body)).status).toBe(403)
    expect((await t.api().post(`/api/v1/tanks/${tankId}/care-tasks`).set(as(other, 'owner')).send(body)).status).toBe(404)
    const created = await t.api().post(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'owner')).send(body)
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ title: 'Clean the substrate', recurrence: { kind: 'weekdays', weekdays: [0, 3] }, active: true })
    const patched = await t.api().patch(`/api/v1/care-tasks/${created.body.id}`).set(as(org, 'owner')).send({ title: 'Vacuum the gravel', active: false })
    expect(patched.body).toMatchObject({ title: 'Vacuum the gravel', recurrence: { kind: 'weekdays', weekdays: [0, 3] }, active: false, due: null })
    expect((await t.api().patch(`/api/v1/care-tasks/${created.body.id}`).set(as(org, 'keeper')).send({ active: true })).status).toBe(403)
  })

  it('refuses bad recurrences with the field named', async () => {
    const tankId = await newTank(t, org)
    const post = (body: object) => t.api().post(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'owner')).send(body)
    expect(badFields(await post({ kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 0 } }))).toEqual(['recurrence.everyDays'])
    expect(badFields(await post({ kind: 'glass_clean', recurrence: { kind: 'weekdays', weekdays: [7] } }))).toEqual(['recurrence.weekdays.0'])
    expect(badFields(await post({ kind: 'sweeping', recurrence: { kind: 'interval', everyDays: 7 } }))).toEqual(['kind'])
  })
})

describe('done and snooze', () => {
  it('marks a task done: a care-log entry, last done now, next due in a week', async () => {
    const tankId = await tankWithDefaults()
    const [change] = await tasksOf(tankId)
    expect((await t.api().post(`/api/v1/care-tasks/${change!.id}/done`).set(as(org, 'viewer')).send({})).status).toBe(403)
    const res = await t
      .api()
      .post(`/api/v1/care-tasks/${change!.id}/done`)
      .set(as(org, 'keeper'))
      .send({ notes: 'Gravel vac too', values: { percent: 15 } })
    expect(res.status, JSON.stringify(res.body)).toBe(200)
    expect(res.body.task.due).toMatchObject({ status: 'later', daysUntilDue: 7 })
    expect(res.body.task.lastDoneBy).toBe(org.users.keeper.id)
    expect(res.body.logEntry).toMatchObject({
      kind: 'task_done',
      text: 'Partial water change: Gravel vac too',
      values: { taskKind: 'water_change', percent: 15 },
      by: { id: org.users.keeper.id },
      careTaskId: change!.id,
    })
    const log = await t.api().get(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'viewer'))
    expect(log.body.map((e: { kind: string }) => e.kind)).toEqual(['task_done'])
  })

  it('snoozes a task with a reason, and refuses a past or missing date', async () => {
    const tankId = await tankWithDefaults()
    const [, rinse] = await tasksOf(tankId)
    const snooze = (body: object) => t.api().post(`/api/v1/care-tasks/${rinse!.id}/snooze`).set(as(org, 'keeper')).send(body)
    const until = new Date(Date.now() + 3 * DAY).toISOString()
    const res = await snooze({ until, reason: 'Filter replaced on Monday' })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ snoozedUntil: until, snoozeReason: 'Filter replaced on Monday', due: { snoozed: true } })
    expect(['due_soon', 'later']).toContain(res.body.due.status)
    expect(badFields(await snooze({ until: isoDaysAgo(1), reason: 'late' }))).toEqual(['until'])
    expect(badFields(await snooze({ until }))).toEqual(['reason'])
    expect(badFields(await snooze({ until: 'tomorrow', reason: 'x' }))).toEqual(['until'])
  })
})

describe('today lists and the site summary', () => {
  it('lists one site’s due and overdue tasks, overdue first, and counts them', async () => {
    const siteId = org.siteIds[1] as number
    const tankId = await tankWithDefaults(siteId)
    const [change, rinse, media, glass] = await tasksOf(tankId)
    await setLastDone(change!.id, new Date(Date.now() - 10 * DAY)) // due 3 days ago
    await setLastDone(rinse!.id, new Date(Date.now() - 20 * DAY)) // due 6 days ago
    await setLastDone(media!.id, new Date(Date.now() - 1 * DAY)) // not for weeks
    await setLastDone(glass!.id, new Date(Date.now() - 7 * DAY)) // due today (or, near midnight, yesterday)
    const res = await t.api().get(`/api/v1/care/today?siteId=${siteId}`).set(as(org, 'viewer'))
    expect(res.status).toBe(200)
    const rows = res.body.tasks.filter((x: { tankId: number }) => x.tankId === tankId)
    expect(rows.map((x: { kind: string }) => x.kind).slice(0, 2)).toEqual(['filter_rinse', 'water_change'])
    expect(rows.map((x: { kind: string }) => x.kind)).not.toContain('media_replace')
    expect(rows[0]).toMatchObject({ due: { status: 'overdue', daysUntilDue: -6 }, site: { id: siteId, timeZone: 'America/New_York' } })
    const summary = await t.api().get(`/api/v1/sites/${siteId}/care-summary`).set(as(org, 'viewer'))
    expect(summary.body.overdue + summary.body.dueToday).toBe(4) // two overdue, glass and the test-kit check
    expect(summary.body.overdue).toBeGreaterThanOrEqual(2)
    expect((await t.api().get(`/api/v1/sites/${siteId}/care-summary`).set(as(other, 'owner'))).status).toBe(404)
  })

  it('answers "mine" with the sites where the caller is on duty now, and every site they may see when on duty nowhere', async () => {
    const siteId = org.siteIds[0] as number
    const tankId = await tankWithDefaults(siteId)
    const mine = () => t.api().get('/api/v1/care/today?mine=true').set(as(org, 'keeper'))
    const before = await mine()
    expect(before.body).toMatchObject({ siteIds: [...org.siteIds].sort((a, b) => a - b), onDuty: false })
    expect(before.body.tasks.filter((x: { tankId: number }) => x.tankId === tankId)).toHaveLength(5)
    await t.ctx.models.DutyOverride.create({
      organizationId: org.organizationId,
      siteId,
      userId: org.users.keeper.id,
      kind: 'add',
      startsAt: new Date(Date.now() - 3600_000),
      endsAt: new Date(Date.now() + 3600_000),
      createdBy: org.users.owner.id,
    })
    const after = await mine()
    expect(after.body).toMatchObject({ siteIds: [siteId], onDuty: true })
    expect(after.body.tasks.filter((x: { tankId: number }) => x.tankId === tankId)).toHaveLength(5)
    expect(badFields(await t.api().get('/api/v1/care/today').set(as(org, 'keeper')))).toEqual(['siteId'])
  })

  it('keeps a viewer on duty nowhere to the sites they may see', async () => {
    const [own, elsewhere] = [org.siteIds[1] as number, org.siteIds[0] as number]
    const [ownTank, otherTank] = [await tankWithDefaults(own), await tankWithDefaults(elsewhere)]
    expect(
      (
        await t
          .api()
          .patch(`/api/v1/users/${org.users.viewer.id}`)
          .set(as(org, 'owner'))
          .send({ siteIds: [own] })
      ).status,
    ).toBe(200)
    try {
      const res = await t.api().get('/api/v1/care/today?mine=true').set(as(org, 'viewer'))
      expect(res.body).toMatchObject({ siteIds: [own], onDuty: false })
      const tankIds = new Set(res.body.tasks.map((x: { tankId: number }) => x.tankId))
      expect([tankIds.has(ownTank), tankIds.has(otherTank)]).toEqual([true, false])
    } finally {
      await t.api().patch(`/api/v1/users/${org.users.viewer.id}`).set(as(org, 'owner')).send({ siteIds: [] })
    }
  })

  it('judges "today" on each site’s own calendar', async () => {
    // 23:30 UTC on 8 March 2026: 00:30 on 9 March in Berlin (CET), 19:30 on 8 March in New York (EDT).
    const now = new Date('2026-03-08T23:30:00Z')
    const berlinTank = await tankWithDefaults(org.siteIds[0])
    const newYorkTank = await tankWithDefaults(org.siteIds[1])
    const done = new Date('2026-03-02T12:00:00Z') // Monday in both zones: weekly tasks due Monday 9 March
    await t.ctx.models.CareTask.update({ lastDoneAt: done }, { where: { tankId: [berlinTank, newYorkTank] } })
    await t.ctx.models.CareTask.update({ active: false }, { where: { tankId: [berlinTank, newYorkTank], kind: ['filter_rinse', 'media_replace'] } })
    const care = careTasksService(t.ctx)
    const berlin = await care.today(actorFor('owner'), { siteId: org.siteIds[0], mine: false }, now)
    const newYork = await care.today(actorFor('owner'), { siteId: org.siteIds[1], mine: false }, now)
    expect(berlin.tasks.filter((x) => x.tankId === berlinTank).map((x) => [x.kind, x.due?.status, x.due?.today])).toEqual([
      ['water_change', 'due_today', '2026-03-09'],
      ['glass_clean', 'due_today', '2026-03-09'],
      ['test_kit_check', 'due_today', '2026-03-09'],
    ])
    expect(newYork.tasks.filter((x) => x.tankId === newYorkTank)).toEqual([])
    const nyTasks = await care.listForTank(actorFor('owner'), newYorkTank, now)
    expect(nyTasks.find((x) => x.kind === 'water_change')?.due).toMatchObject({ status: 'due_soon', today: '2026-03-08', dueOn: '2026-03-09' })
  })
})
