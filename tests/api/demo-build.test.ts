import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { DEMO_BUILD_TANK, seedDemoBuild } from '../../server/demo/demo-build'
import type { TestOrg } from '../helpers/app'
import { as, startCareTestApp, type CareTestApp } from './care-helpers'

let t: CareTestApp
let org: TestOrg
beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Demo Build Org')
})
afterAll(() => t.close())

describe('the demo tank mid-build', () => {
  it('stands on build day 9 of about 28 with four steps ticked and the cycle under way, once', async () => {
    const actor: UserActor = { kind: 'user', userId: org.users.owner.id, organizationId: org.organizationId, role: 'owner', siteIds: null, sessionId: 'seed' }
    const siteId = org.siteIds[0] as number
    const tankId = await seedDemoBuild(t.ctx, { actor, siteId })
    expect(tankId).not.toBeNull()
    expect(await seedDemoBuild(t.ctx, { actor, siteId })).toBeNull()
    const build = (await t.api().get(`/api/v1/tanks/${tankId}/build`).set(as(org, 'viewer'))).body
    expect(build).toMatchObject({ day: 9, aboutDays: 28, cycled: false, finishedAt: null })
    expect(build.steps.filter((s: { doneAt: string | null }) => s.doneAt).map((s: { key: string }) => s.key)).toEqual([
      'conditioner',
      'heater_check',
      'ph',
      'plants',
    ])
    const tank = (await t.api().get(`/api/v1/tanks/${tankId}`).set(as(org, 'viewer'))).body
    expect(tank).toMatchObject({ name: DEMO_BUILD_TANK, stage: 'cycling', substrateDepthCm: 6 })
    const cycling = (await t.api().get(`/api/v1/tanks/${tankId}/cycling`).set(as(org, 'viewer'))).body
    expect(cycling.phase).toBe('nitrite')
    expect(cycling.ammoniaPeak).toMatchObject({ value: 1.5, passed: true })
    const cyclingTask = (await t.api().get(`/api/v1/tanks/${tankId}/care-tasks`).set(as(org, 'viewer'))).body.find((x: { title: string }) =>
      x.title.includes('Cycling tests'),
    )
    expect(cyclingTask.due.status).not.toBe('overdue')
    const wall = (await t.api().get(`/api/v1/sites/${siteId}/wall`).set(as(org, 'viewer'))).body
    expect(wall.tanks.find((x: { id: number }) => x.id === tankId).buildDay).toEqual({ day: 9, aboutDays: 28 })
  })
})
