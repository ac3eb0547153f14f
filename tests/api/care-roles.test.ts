import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import { waterChangesService } from '../../server/care/water-changes'
import type { TestOrg } from '../helpers/app'
import { newTank, startCareTestApp, type CareTestApp } from './care-helpers'
import { callAs, ownerOnly, readable, roleCases, tokenOf, writers, type RoleRow } from '../helpers/role-table'

// Who may do what on the care routes: reads for every role, writes (done, snooze, log,
// water changes, livestock) for owners and keepers, the task schedule for owners only;
// another organization gets 404, no token 401. The same rows belong in route-roles.test.ts.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Care Roles Org')
  other = await t.createOrg('Other Care Roles Org')
})
afterAll(() => t.close())

const freshTank = () => newTank(t, org)
async function freshTask() {
  const tankId = await freshTank()
  const [task] = await createDefaultCareTasks(t.ctx, (await t.ctx.models.Tank.findByPk(tankId))!)
  return task!.id
}
async function freshEntry() {
  const tankId = await freshTank()
  const entry = await t.ctx.models.LivestockEntry.create({
    organizationId: org.organizationId,
    tankId,
    speciesKey: null,
    name: 'Probe fish',
    category: 'fish',
    count: 3,
    addedAt: new Date(),
  })
  return `${tankId}/livestock/${entry.id}`
}
async function freshChange() {
  const actor: UserActor = { kind: 'user', userId: org.users.keeper.id, organizationId: org.organizationId, role: 'keeper', siteIds: null, sessionId: 'roles' }
  return (await waterChangesService(t.ctx).start(actor, await freshTank(), { percent: 10, heaterOffConfirmed: false })).id
}

const ROWS: RoleRow[] = [
  ['get', '/tanks/:id/care-tasks', readable, async () => ({ path: `/tanks/${await freshTank()}/care-tasks` })],
  [
    'post',
    '/tanks/:id/care-tasks',
    ownerOnly(201),
    async () => ({ path: `/tanks/${await freshTank()}/care-tasks`, body: { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 7 } } }),
  ],
  ['get', '/tanks/:id/care-log', readable, async () => ({ path: `/tanks/${await freshTank()}/care-log` })],
  ['post', '/tanks/:id/care-log', writers(201), async () => ({ path: `/tanks/${await freshTank()}/care-log`, body: { kind: 'note', text: 'Lid cleaned' } })],
  ['get', '/tanks/:id/water-changes', readable, async () => ({ path: `/tanks/${await freshTank()}/water-changes` })],
  ['post', '/tanks/:id/water-changes/plan', readable, async () => ({ path: `/tanks/${await freshTank()}/water-changes/plan`, body: { percent: 10 } })],
  ['post', '/tanks/:id/water-changes', writers(201), async () => ({ path: `/tanks/${await freshTank()}/water-changes`, body: { percent: 10 } })],
  ['get', '/tanks/:id/livestock', readable, async () => ({ path: `/tanks/${await freshTank()}/livestock` })],
  [
    'post',
    '/tanks/:id/livestock',
    writers(201),
    async () => ({ path: `/tanks/${await freshTank()}/livestock`, body: { speciesKey: 'zebra_danio', count: 6 } }),
  ],
  ['patch', '/tanks/:id/livestock/:entryId', writers(200), async () => ({ path: `/tanks/${await freshEntry()}`, body: { losses: 1 } })],
  ['get', '/tanks/:id/cycling', readable, async () => ({ path: `/tanks/${await freshTank()}/cycling` })],
  ['patch', '/care-tasks/:id', ownerOnly(200), async () => ({ path: `/care-tasks/${await freshTask()}`, body: { title: 'Renamed task' } })],
  ['post', '/care-tasks/done', writers(200), async () => ({ path: '/care-tasks/done', body: { tasks: [{ id: await freshTask(), seenLastDoneAt: null }] } })],
  ['post', '/care-tasks/:id/done', writers(200), async () => ({ path: `/care-tasks/${await freshTask()}/done`, body: {} })],
  [
    'post',
    '/care-tasks/:id/snooze',
    writers(200),
    async () => ({
      path: `/care-tasks/${await freshTask()}/snooze`,
      body: { until: new Date(Date.now() + 86_400_000).toISOString(), reason: 'Parts on order' },
    }),
  ],
  ['post', '/water-changes/:id/finish', writers(200), async () => ({ path: `/water-changes/${await freshChange()}/finish`, body: { litresReplaced: 18 } })],
  ['post', '/water-changes/:id/cancel', writers(200), async () => ({ path: `/water-changes/${await freshChange()}/cancel`, body: { reason: 'Called away' } })],
  ['get', '/care/today', readable, async () => ({ path: `/care/today?siteId=${org.siteIds[0]}` })],
  ['get', '/care/species', [200, 200, 200, 200], async () => ({ path: '/care/species' })],
  ['get', '/sites/:id/care-summary', readable, async () => ({ path: `/sites/${org.siteIds[0]}/care-summary` })],
]

describe('care route roles', () => {
  it.each(roleCases(ROWS))('$method $route as $caller → $status', async ({ method, caller, status, prepare }) => {
    const res = await callAs(t, method, await prepare(), tokenOf(caller, org, other))
    expect(res.status, JSON.stringify(res.body)).toBe(status)
  })
})
