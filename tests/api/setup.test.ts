import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { setupCodeFor } from '../../server/setup/setup'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

// The app trusts a proxy on loopback, so X-Forwarded-For stands in for a caller on another machine.
let t: Awaited<ReturnType<typeof startTestApp>>
const STRANGER = '203.0.113.9'
const from = (address: string) => ({ 'X-Forwarded-For': address })
const business = (overrides: Record<string, unknown> = {}) => ({
  businessName: 'Reef and Stream',
  ownerName: 'Mara Quell',
  email: 'Mara@Reef-Stream.example',
  password: 'a-long-enough-password',
  siteName: 'Main shop',
  timeZone: 'Europe/Lisbon',
  ...overrides,
})

beforeAll(async () => {
  t = await startTestApp({ trustProxy: ['loopback'], signInLimit: 10 })
})
afterAll(async () => {
  await t.close()
})

describe('setting up an empty installation', () => {
  it('says setup is needed, and asks for the printed code only away from the server', async () => {
    expect((await t.api().get('/api/v1/setup')).body).toEqual({ needed: true, codeRequired: false })
    expect((await t.api().get('/api/v1/setup').set(from(STRANGER))).body).toEqual({ needed: true, codeRequired: true })
  })

  it('refuses bad input with the fields named, and writes nothing', async () => {
    const res = await t
      .api()
      .post('/api/v1/setup')
      .send(business({ email: 'not-an-address', password: 'short', timeZone: 'Mars/Olympus', businessName: ' ' }))
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['businessName', 'email', 'password', 'timeZone'])
    expect(await t.ctx.models.Organization.count()).toBe(0)
  })

  it('refuses another machine without the right code (403) and writes nothing', async () => {
    const none = await t.api().post('/api/v1/setup').set(from(STRANGER)).send(business())
    expect(none.status).toBe(403)
    expect(none.body.error.code).toBe('setup_code')
    const wrong = await t
      .api()
      .post('/api/v1/setup')
      .set(from(STRANGER))
      .send(business({ code: 'AAAA-AAAA' }))
    expect(wrong.status).toBe(403)
    expect(await t.ctx.models.Organization.count()).toBe(0)
  })

  it('sets up the business, its first site and its owner from another machine with the code, signed in', async () => {
    const code = setupCodeFor(t.ctx).toLowerCase()
    const res = await t.api().post('/api/v1/setup').set(from(STRANGER)).send(business({ code }))
    expect(res.status).toBe(201)
    expect(res.body.organization.name).toBe('Reef and Stream')
    expect(res.body.user).toMatchObject({ email: 'mara@reef-stream.example', name: 'Mara Quell', role: 'owner' })
    const me = await t.api().get('/api/v1/auth/me').set(bearer(res.body.token))
    expect(me.status).toBe(200)
    const sites = await t.ctx.models.Site.findAll()
    expect(sites.map((s) => [s.name, s.timeZone])).toEqual([['Main shop', 'Europe/Lisbon']])
  })

  it('is refused (409) once a business exists, from anywhere, and says setup is no longer needed', async () => {
    const local = await t
      .api()
      .post('/api/v1/setup')
      .send(business({ email: 'second@reef-stream.example' }))
    expect(local.status).toBe(409)
    expect(local.body.error.code).toBe('already_set_up')
    expect(
      (
        await t
          .api()
          .post('/api/v1/setup')
          .set(from(STRANGER))
          .send(business({ code: setupCodeFor(t.ctx) }))
      ).status,
    ).toBe(409)
    expect((await t.api().get('/api/v1/setup')).body.needed).toBe(false)
    expect(await t.ctx.models.Organization.count()).toBe(1)
    expect(await t.ctx.models.User.count()).toBe(1)
  })

  it('limits attempts per address (429 after the sign-in allowance)', async () => {
    const statuses: number[] = []
    for (let i = 0; i < 11; i++)
      statuses.push(
        (
          await t
            .api()
            .post('/api/v1/setup')
            .set(from('198.51.100.7'))
            .send(business({ code: 'BBBB-BBBB' }))
        ).status,
      )
    expect(statuses.slice(0, 10).every((s) => s === 409)).toBe(true)
    expect(statuses[10]).toBe(429)
  })
})

describe('the first-steps checklist', () => {
  let org: TestOrg
  beforeAll(async () => {
    org = await t.createOrg('Checklist Org')
  })
  const owner = () => bearer(org.users.owner.token)
  const steps = async () =>
    (await t.api().get('/api/v1/setup/checklist').set(owner())).body.items.map((i: { step: string; done: boolean }) => `${i.step}:${i.done}`)

  it('is computed from the data and drops the steps the owner dismisses', async () => {
    // The fixture organisation has a keeper and a viewer already: the people step is done.
    expect(await steps()).toEqual(['tanks:false', 'device:false', 'roster:false', 'people:true', 'wall:false'])
    expect((await t.api().post('/api/v1/tanks').set(owner()).send(sampleTank(org.siteIds[0]))).status).toBe(201)
    expect((await t.api().post('/api/v1/setup/checklist/wall/dismiss').set(owner())).status).toBe(204)
    expect((await t.api().post('/api/v1/setup/checklist/wall/dismiss').set(owner())).status).toBe(204)
    expect(await steps()).toEqual(['tanks:true', 'device:false', 'roster:false', 'people:true'])
  })

  it('refuses keepers (403) and an unknown step (400 naming it)', async () => {
    expect((await t.api().get('/api/v1/setup/checklist').set(bearer(org.users.keeper.token))).status).toBe(403)
    const res = await t.api().post('/api/v1/setup/checklist/coffee/dismiss').set(owner())
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('step')
  })
})

describe('copies of a tank', () => {
  let org: TestOrg
  let sourceId: number
  beforeAll(async () => {
    org = await t.createOrg('Copy Org')
    const owner = bearer(org.users.owner.token)
    sourceId = (
      await t
        .api()
        .post('/api/v1/tanks')
        .set(owner)
        .send(sampleTank(org.siteIds[0], { name: 'Rack 1' }))
    ).body.id
    await t
      .api()
      .post('/api/v1/tanks')
      .set(owner)
      .send(sampleTank(org.siteIds[0], { name: 'Rack 3' }))
    // A rule and a care task of the tank's own, beyond its starter set, travel with the copies.
    await t.ctx.models.CareTask.create({
      organizationId: org.organizationId,
      tankId: sourceId,
      kind: 'other',
      title: 'Check the auto top-off',
      recurrence: { kind: 'interval', everyDays: 3 },
    })
  })

  it('makes numbered copies with the same kind, size, equipment, targets, rules and care tasks, skipping taken names', async () => {
    const res = await t.api().post(`/api/v1/tanks/${sourceId}/duplicate`).set(bearer(org.users.keeper.token)).send({ count: 3 })
    expect(res.status).toBe(201)
    expect(res.body.items.map((x: { name: string }) => x.name)).toEqual(['Rack 2', 'Rack 4', 'Rack 5'])
    const source = await t.ctx.models.Tank.findByPk(sourceId)
    const sourceRules = await t.ctx.models.WatchRule.findAll({ where: { tankId: sourceId }, order: [['id', 'ASC']] })
    const sourceTasks = await t.ctx.models.CareTask.findAll({ where: { tankId: sourceId }, order: [['id', 'ASC']] })
    expect(sourceRules.length).toBeGreaterThan(0)
    for (const copy of res.body.items) {
      const tank = await t.ctx.models.Tank.findByPk(copy.id)
      expect(tank).toMatchObject({ kind: source!.kind, volumeLitres: source!.volumeLitres, siteId: source!.siteId })
      expect(tank!.dimensions).toEqual(source!.dimensions)
      expect(tank!.heater).toEqual(source!.heater)
      expect(tank!.targets).toEqual(source!.targets)
      const rules = await t.ctx.models.WatchRule.findAll({ where: { tankId: copy.id }, order: [['id', 'ASC']] })
      expect(rules.map((r) => [r.name, r.spec])).toEqual(sourceRules.map((r) => [r.name, r.spec]))
      const tasks = await t.ctx.models.CareTask.findAll({ where: { tankId: copy.id }, order: [['id', 'ASC']] })
      expect(tasks.map((x) => [x.kind, x.title, x.lastDoneAt])).toEqual(sourceTasks.map((x) => [x.kind, x.title, null]))
    }
  })

  it('refuses a count outside 1–50 (400 naming count), viewers (403) and other organisations (404)', async () => {
    const owner = bearer(org.users.owner.token)
    for (const count of [0, 51, 2.5, '3']) {
      const res = await t.api().post(`/api/v1/tanks/${sourceId}/duplicate`).set(owner).send({ count })
      expect(res.status).toBe(400)
      expect(res.body.error.fields).toHaveProperty('count')
    }
    expect((await t.api().post(`/api/v1/tanks/${sourceId}/duplicate`).set(bearer(org.users.viewer.token)).send({ count: 1 })).status).toBe(403)
    const other = await t.createOrg('Other Copy Org')
    expect((await t.api().post(`/api/v1/tanks/${sourceId}/duplicate`).set(bearer(other.users.owner.token)).send({ count: 1 })).status).toBe(404)
  })
})
