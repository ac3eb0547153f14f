import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { buildsService } from '../../server/builds/builds'
import { buildPlanSchema } from '@shared/schemas/build'
import type { TestOrg } from '../helpers/app'
import { bearer } from '../helpers/app'
import { localDaysAgo, PLAN_60, TANK_60 } from '../helpers/build-plan'
import { newTank, startCareTestApp, type CareTestApp } from './care-helpers'

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

type Caller = 'owner' | 'keeper' | 'viewer' | 'otherOrg' | 'noToken'
type Prepared = { path: string; body?: object }
const readable = [200, 200, 200, 404]
const writers = [200, 200, 403, 404]

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

const ROWS: Array<[string, string, number[], () => Promise<Prepared>]> = [
  ['get', '/tanks/:id/build', readable, async () => ({ path: `/tanks/${await plannedTank()}/build` })],
  ['put', '/tanks/:id/build/plan', writers, async () => ({ path: `/tanks/${await freshTank()}/build/plan`, body: PLAN_60 })],
  [
    'post',
    '/tanks/:id/build/start',
    writers,
    async () => ({ path: `/tanks/${await plannedTank()}/build/start`, body: { filledOn: localDaysAgo('Europe/Berlin', 1) } }),
  ],
  ['post', '/tanks/:id/build/steps/:key/done', writers, async () => ({ path: `/tanks/${await filledTank()}/build/steps/conditioner/done`, body: {} })],
  ['get', '/tanks/:id/build/templates', readable, async () => ({ path: `/tanks/${await freshTank()}/build/templates` })],
  ['get', '/tanks/:id/build/report/pdf', readable, async () => ({ path: `/tanks/${await plannedTank()}/build/report/pdf` })],
  [
    'post',
    '/tanks/:id/build/report/mail',
    writers,
    async () => ({ path: `/tanks/${await plannedTank()}/build/report/mail`, body: { emails: ['client@example.test'] } }),
  ],
]

const CALLERS: Caller[] = ['owner', 'keeper', 'viewer', 'otherOrg', 'noToken']
const cases = ROWS.flatMap(([method, route, expected, prepare]) =>
  CALLERS.map((caller, i) => ({ method, route, caller, status: caller === 'noToken' ? 401 : (expected[i] as number), prepare })),
)

describe('build route roles', () => {
  it.each(cases)('$method $route as $caller → $status', async ({ method, caller, status, prepare }) => {
    const { path, body } = await prepare()
    const token = caller === 'otherOrg' ? other.users.owner.token : caller === 'noToken' ? null : org.users[caller].token
    let req = (t.api() as unknown as Record<string, (p: string) => ReturnType<ReturnType<typeof t.api>['get']>>)[method]!(`/api/v1${path}`)
    if (token) req = req.set(bearer(token))
    const res = body ? await req.send(body) : await req
    expect(res.status, JSON.stringify(res.body)).toBe(status)
  })

  it('a refused write leaves no build behind', async () => {
    const tankId = await freshTank()
    const res = await t.api().put(`/api/v1/tanks/${tankId}/build/plan`).set(bearer(org.users.viewer.token)).send(PLAN_60)
    expect(res.status).toBe(403)
    expect(await t.ctx.models.TankBuild.count({ where: { tankId } })).toBe(0)
  })
})
