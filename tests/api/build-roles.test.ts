import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { buildsService } from '../../server/builds/builds'
import { buildPlanSchema } from '@shared/schemas/build'
import type { TestOrg } from '../helpers/app'
import { bearer } from '../helpers/app'
import { localDaysAgo, PLAN_60, TANK_60 } from '../helpers/build-plan'
import { newTank, startCareTestApp, type CareTestApp } from './care-helpers'
import { callAs, readable, roleCases, tokenOf, writers, type RoleRow } from '../helpers/role-table'

// Who may do what on the build routes: reads (plan, templates, report PDF) for every role,
// writes (plan, fill, ticks, report mail) for owners and keepers; another organization gets 404,
// no token 401. The same routes are listed in route-roles.test.ts.
let t: CareTestApp
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Build Roles Org')
  other = await t.createOrg('Other Build Roles Org')
})
afterAll(() => t.close())

const owner = (): UserActor => ({
  kind: 'user',
  userId: org.users.owner.id,
  organizationId: org.organizationId,
  role: 'owner',
  siteIds: null,
  sessionId: 'roles',
})
const freshTank = () => newTank(t, org, { dimensions: TANK_60, heater: null })
async function plannedTank() {
  const tankId = await freshTank()
  await buildsService(t.ctx).savePlan(owner(), tankId, buildPlanSchema.parse(PLAN_60))
  return tankId
}
async function filledTank() {
  const tankId = await plannedTank()
  await buildsService(t.ctx).start(owner(), tankId, { filledOn: localDaysAgo('Europe/Berlin', 2) })
  return tankId
}

const ROWS: RoleRow[] = [
  ['get', '/tanks/:id/build', readable, async () => ({ path: `/tanks/${await plannedTank()}/build` })],
  ['put', '/tanks/:id/build/plan', writers(200), async () => ({ path: `/tanks/${await freshTank()}/build/plan`, body: PLAN_60 })],
  [
    'post',
    '/tanks/:id/build/start',
    writers(200),
    async () => ({ path: `/tanks/${await plannedTank()}/build/start`, body: { filledOn: localDaysAgo('Europe/Berlin', 1) } }),
  ],
  ['post', '/tanks/:id/build/steps/:key/done', writers(200), async () => ({ path: `/tanks/${await filledTank()}/build/steps/conditioner/done`, body: {} })],
  ['get', '/tanks/:id/build/templates', readable, async () => ({ path: `/tanks/${await freshTank()}/build/templates` })],
  ['get', '/tanks/:id/build/report/pdf', readable, async () => ({ path: `/tanks/${await plannedTank()}/build/report/pdf` })],
  [
    'post',
    '/tanks/:id/build/report/mail',
    writers(200),
    async () => ({ path: `/tanks/${await plannedTank()}/build/report/mail`, body: { emails: ['client@example.test'] } }),
  ],
]

describe('build route roles', () => {
  it.each(roleCases(ROWS))('$method $route as $caller → $status', async ({ method, caller, status, prepare }) => {
    const res = await callAs(t, method, await prepare(), tokenOf(caller, org, other))
    expect(res.status, JSON.stringify(res.body)).toBe(status)
  })

  it('a refused write leaves no build behind', async () => {
    const tankId = await freshTank()
    const res = await t.api().put(`/api/v1/tanks/${tankId}/build/plan`).set(bearer(org.users.viewer.token)).send(PLAN_60)
    expect(res.status).toBe(403)
    expect(await t.ctx.models.TankBuild.count({ where: { tankId } })).toBe(0)
  })
})
