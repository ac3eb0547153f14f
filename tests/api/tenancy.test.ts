import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let alpha: TestOrg
let beta: TestOrg
/** Tank ids by organization, each on the organization's first and second site. */
const tanks = { alpha: [] as number[], beta: [] as number[] }
const invitations = { alpha: 0, beta: 0 }

const get = (path: string, token: string) => t.api().get(`/api/v1${path}`).set(bearer(token))
const ids = (rows: Array<{ id: number }>) => rows.map((r) => r.id).sort((a, b) => a - b)
const sorted = (values: number[]) => [...values].sort((a, b) => a - b)

async function createTank(org: TestOrg, siteId: number, name: string) {
  const res = await t.api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send(sampleTank(siteId, { name }))
  expect(res.status).toBe(201)
  return res.body.id as number
}

async function invite(org: TestOrg, email: string) {
  const res = await t.api().post('/api/v1/users/invitations').set(bearer(org.users.owner.token)).send({ email, name: 'Invitee', role: 'keeper' })
  expect(res.status).toBe(201)
  return res.body.invitation.id as number
}

beforeAll(async () => {
  t = await startTestApp()
  alpha = await t.createOrg('Alpha')
  beta = await t.createOrg('Beta')
  tanks.alpha = [await createTank(alpha, alpha.siteIds[0], 'Alpha reef'), await createTank(alpha, alpha.siteIds[1], 'Alpha guppies')]
  tanks.beta = [await createTank(beta, beta.siteIds[0], 'Beta reef'), await createTank(beta, beta.siteIds[1], 'Beta guppies')]
  invitations.alpha = await invite(alpha, 'new@alpha.example')
  invitations.beta = await invite(beta, 'new@beta.example')
})
afterAll(() => t.close())

describe('lists never carry another organization’s rows', () => {
  it.each(['owner', 'keeper', 'viewer'] as const)('sites and tanks as %s', async (role) => {
    for (const [org, own] of [
      [alpha, 'alpha'],
      [beta, 'beta'],
    ] as const) {
      const sites = await get('/sites?includeArchived=true', org.users[role].token)
      expect(sites.status).toBe(200)
      expect(ids(sites.body)).toEqual(sorted(org.siteIds))
      const list = await get('/tanks?includeArchived=true&pageSize=200', org.users[role].token)
      expect(list.status).toBe(200)
      expect(list.body.total).toBe(2)
      expect(ids(list.body.items)).toEqual(sorted(tanks[own]))
    }
  })

  it('a search or a site filter naming the other organization finds nothing', async () => {
    const search = await get('/tanks?search=Beta', alpha.users.owner.token)
    expect(search.body).toEqual({ items: [], total: 0, page: 1, pageSize: 25 })
    const bySite = await get(`/tanks?siteId=${beta.siteIds[0]}`, alpha.users.owner.token)
    expect(bySite.status).toBe(200)
    expect(bySite.body.total).toBe(0)
    expect(bySite.body.items).toEqual([])
  })

  it('users and invitations', async () => {
    const users = await get('/users', alpha.users.owner.token)
    expect(users.status).toBe(200)
    expect(ids(users.body)).toEqual(sorted([alpha.users.owner.id, alpha.users.keeper.id, alpha.users.viewer.id]))
    expect(new Set(users.body.map((u: { organizationId: number }) => u.organizationId))).toEqual(new Set([alpha.organizationId]))
    const invites = await get('/users/invitations', alpha.users.owner.token)
    expect(invites.body.map((i: { id: number; email: string }) => [i.id, i.email])).toEqual([[invitations.alpha, 'new@alpha.example']])
  })

  it('the site tank count counts only the site’s own tanks', async () => {
    const sites = await get('/sites', beta.users.owner.token)
    expect(sites.body.map((s: { tankCount: number }) => s.tankCount)).toEqual([1, 1])
  })
})

describe('another organization’s row answers 404, and stays untouched', () => {
  it('detail and write routes on the other organization’s rows', async () => {
    const token = alpha.users.owner.token
    const [site, tank] = [beta.siteIds[0], tanks.beta[0]]
    const attempts = [
      t.api().get(`/api/v1/sites/${site}`).set(bearer(token)),
      t.api().patch(`/api/v1/sites/${site}`).set(bearer(token)).send({ name: 'Taken over' }),
      t.api().post(`/api/v1/sites/${site}/archive`).set(bearer(token)),
      t.api().get(`/api/v1/tanks/${tank}`).set(bearer(token)),
      t.api().patch(`/api/v1/tanks/${tank}`).set(bearer(token)).send({ name: 'Taken over' }),
      t.api().post(`/api/v1/tanks/${tank}/archive`).set(bearer(token)),
      t.api().patch(`/api/v1/users/${beta.users.keeper.id}`).set(bearer(token)).send({ role: 'viewer' }),
      t.api().delete(`/api/v1/users/invitations/${invitations.beta}`).set(bearer(token)),
    ]
    for (const res of await Promise.all(attempts)) {
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
    }
    const betaToken = beta.users.owner.token
    const betaSite = await get(`/sites/${site}`, betaToken)
    expect([betaSite.body.name, betaSite.body.archivedAt]).toEqual(['Beta shop', null])
    const betaTank = await get(`/tanks/${tank}`, betaToken)
    expect([betaTank.body.name, betaTank.body.archivedAt]).toEqual(['Beta reef', null])
    const betaUsers = await get('/users', betaToken)
    expect(betaUsers.body.find((u: { id: number }) => u.id === beta.users.keeper.id).role).toBe('keeper')
    expect(ids((await get('/users/invitations', betaToken)).body)).toEqual([invitations.beta])
  })

  it('the other organization’s site cannot be used in a body', async () => {
    const token = alpha.users.owner.token
    const create = await t.api().post('/api/v1/tanks').set(bearer(token)).send(sampleTank(beta.siteIds[0]))
    expect(create.status).toBe(400)
    expect(create.body.error.fields).toEqual({ siteId: 'no such site' })
    const move = await t.api().patch(`/api/v1/tanks/${tanks.alpha[0]}`).set(bearer(token)).send({ siteId: beta.siteIds[0] })
    expect(move.status).toBe(400)
    expect(move.body.error.fields).toEqual({ siteId: 'no such site' })
    const inviteViewer = await t
      .api()
      .post('/api/v1/users/invitations')
      .set(bearer(token))
      .send({ email: 'spy@alpha.example', name: 'Spy', role: 'viewer', siteIds: [beta.siteIds[0]] })
    expect(inviteViewer.status).toBe(400)
    expect(inviteViewer.body.error.fields).toEqual({ siteIds: 'unknown site' })
    const limit = await t
      .api()
      .patch(`/api/v1/users/${alpha.users.viewer.id}`)
      .set(bearer(token))
      .send({ siteIds: [beta.siteIds[1]] })
    expect(limit.status).toBe(400)
    expect(limit.body.error.fields).toEqual({ siteIds: 'unknown site' })
  })
})

describe('a viewer limited to one site', () => {
  let viewerToken: string
  let ownSite: number
  let otherSite: number

  beforeAll(async () => {
    ;[ownSite, otherSite] = alpha.siteIds
    viewerToken = alpha.users.viewer.token
    const res = await t
      .api()
      .patch(`/api/v1/users/${alpha.users.viewer.id}`)
      .set(bearer(alpha.users.owner.token))
      .send({ siteIds: [ownSite] })
    expect(res.status).toBe(200)
    expect(res.body.siteIds).toEqual([ownSite])
  })

  it('lists only that site, with or without archived sites', async () => {
    for (const path of ['/sites', '/sites?includeArchived=true']) {
      const res = await get(path, viewerToken)
      expect(res.status).toBe(200)
      expect(res.body.map((s: { id: number; tankCount: number }) => [s.id, s.tankCount])).toEqual([[ownSite, 1]])
    }
    expect((await get(`/sites/${ownSite}`, viewerToken)).status).toBe(200)
    const hidden = await get(`/sites/${otherSite}`, viewerToken)
    expect(hidden.status).toBe(404)
    expect(hidden.body.error.code).toBe('not_found')
  })

  it('lists only that site’s tanks; another site’s tank is 404 and filtering by it is empty', async () => {
    const all = await get('/tanks?includeArchived=true', viewerToken)
    expect(all.body.total).toBe(1)
    expect(all.body.items.map((i: { id: number; siteId: number }) => [i.id, i.siteId])).toEqual([[tanks.alpha[0], ownSite]])
    expect((await get(`/tanks/${tanks.alpha[0]}`, viewerToken)).status).toBe(200)
    expect((await get(`/tanks/${tanks.alpha[1]}`, viewerToken)).status).toBe(404)
    const filtered = await get(`/tanks?siteId=${otherSite}`, viewerToken)
    expect(filtered.status).toBe(200)
    expect(filtered.body).toEqual({ items: [], total: 0, page: 1, pageSize: 25 })
    expect((await get(`/tanks?siteId=${ownSite}`, viewerToken)).body.total).toBe(1)
    expect((await get('/tanks?search=guppies', viewerToken)).body.total).toBe(0)
  })

  it('sees every site again once the limit is cleared', async () => {
    const res = await t.api().patch(`/api/v1/users/${alpha.users.viewer.id}`).set(bearer(alpha.users.owner.token)).send({ siteIds: [] })
    expect(res.body.siteIds).toEqual([])
    expect(ids((await get('/sites', viewerToken)).body)).toEqual(sorted(alpha.siteIds))
    expect((await get('/tanks', viewerToken)).body.total).toBe(2)
    expect((await get(`/tanks/${tanks.alpha[1]}`, viewerToken)).status).toBe(200)
  })
})
