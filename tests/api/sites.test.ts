import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let owner: Record<string, string>

const createSite = (body: object, auth = owner) => t.api().post('/api/v1/sites').set(auth).send(body)
const patchSite = (id: number, body: object) => t.api().patch(`/api/v1/sites/${id}`).set(owner).send(body)
const listSites = (query = '') => t.api().get(`/api/v1/sites${query}`).set(owner)

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Site Org')
  owner = bearer(org.users.owner.token)
})
afterAll(() => t.close())

describe('create', () => {
  it('answers the public site with defaults filled and text trimmed', async () => {
    const res = await createSite({ name: '  Harbour shop ', timeZone: 'Europe/Lisbon', address: '1 Quay Street' })
    expect(res.status).toBe(201)
    expect(res.body).toEqual({
      id: expect.any(Number),
      name: 'Harbour shop',
      timeZone: 'Europe/Lisbon',
      address: '1 Quay Street',
      notes: '',
      workdayEnd: null,
      archivedAt: null,
      tankCount: 0,
    })
    const fetched = await t.api().get(`/api/v1/sites/${res.body.id}`).set(owner)
    expect(fetched.body).toEqual(res.body)
  })

  it.each([
    ['an unknown time zone', { name: 'Moon base', timeZone: 'Mars/Olympus_Mons' }, 'timeZone', 'unknown time zone'],
    ['a time zone abbreviation that is not a zone', { name: 'Shop', timeZone: 'Central Time' }, 'timeZone', 'unknown time zone'],
    ['a blank name', { name: '  ', timeZone: 'UTC' }, 'name', 'required'],
  ])('refuses %s with the field named', async (_name, body, field, message) => {
    const res = await createSite(body)
    expect(res.status).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(res.body.error.fields).toEqual({ [field]: message })
  })

  it('names both fields when both are missing', async () => {
    const res = await createSite({})
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['name', 'timeZone'])
  })

  it('is for owners only', async () => {
    const res = await createSite({ name: 'Keeper’s idea', timeZone: 'UTC' }, bearer(org.users.keeper.token))
    expect([res.status, res.body.error.code]).toEqual([403, 'forbidden'])
    expect((await listSites()).body.map((s: { name: string }) => s.name)).not.toContain('Keeper’s idea')
  })
})

describe('update', () => {
  it('changes only the fields sent', async () => {
    const site = (await createSite({ name: 'Old name', timeZone: 'Europe/Oslo', address: 'Pier 4', notes: 'Back door code at the desk' })).body
    const res = await patchSite(site.id, { name: 'New name' })
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ ...site, name: 'New name' })
    const zone = await patchSite(site.id, { timeZone: 'Asia/Kolkata' })
    expect(zone.body).toEqual({ ...site, name: 'New name', timeZone: 'Asia/Kolkata' })
  })

  it('validates the time zone and answers 404 for an unknown site', async () => {
    const site = (await createSite({ name: 'Zone check', timeZone: 'UTC' })).body
    const bad = await patchSite(site.id, { timeZone: 'Nowhere/Town' })
    expect([bad.status, bad.body.error.fields]).toEqual([400, { timeZone: 'unknown time zone' }])
    expect((await t.api().get(`/api/v1/sites/${site.id}`).set(owner)).body.timeZone).toBe('UTC')
    const missing = await patchSite(987_654, { name: 'Ghost' })
    expect([missing.status, missing.body.error.code]).toEqual([404, 'not_found'])
  })
})

describe('archive', () => {
  it('hides the site from the list unless includeArchived=true, and unarchive brings it back', async () => {
    const site = (await createSite({ name: 'Closing down', timeZone: 'UTC' })).body
    const byKeeper = await t.api().post(`/api/v1/sites/${site.id}/archive`).set(bearer(org.users.keeper.token))
    expect(byKeeper.status).toBe(403)
    const archived = await t.api().post(`/api/v1/sites/${site.id}/archive`).set(owner)
    expect(archived.status).toBe(200)
    expect(Date.parse(archived.body.archivedAt)).toBeGreaterThan(Date.now() - 60_000)
    const visible = (await listSites()).body.map((s: { id: number }) => s.id)
    expect(visible).not.toContain(site.id)
    expect(visible).toEqual(expect.arrayContaining(org.siteIds))
    const all = (await listSites('?includeArchived=true')).body.map((s: { id: number }) => s.id)
    expect(all).toContain(site.id)
    expect((await t.api().get(`/api/v1/sites/${site.id}`).set(owner)).body.archivedAt).toBe(archived.body.archivedAt)
    const back = await t.api().post(`/api/v1/sites/${site.id}/unarchive`).set(owner)
    expect([back.status, back.body.archivedAt]).toEqual([200, null])
    expect((await listSites()).body.map((s: { id: number }) => s.id)).toContain(site.id)
  })

  it('lists sites by name and refuses a malformed includeArchived', async () => {
    const names = (await listSites()).body.map((s: { name: string }) => s.name)
    expect(names).toEqual([...names].sort((a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0)))
    const bad = await listSites('?includeArchived=yes')
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields)).toEqual(['includeArchived'])
  })
})

describe('tankCount', () => {
  it('counts the site’s tanks that are not archived, in the list, the detail and after an update', async () => {
    const site = (await createSite({ name: 'Counting room', timeZone: 'UTC' })).body
    const ids: number[] = []
    for (const name of ['One', 'Two', 'Three']) {
      const res = await t.api().post('/api/v1/tanks').set(owner).send(sampleTank(site.id, { name }))
      expect(res.status).toBe(201)
      ids.push(res.body.id)
    }
    expect((await t.api().post(`/api/v1/tanks/${ids[0]}/archive`).set(owner)).status).toBe(200)
    const listed = (await listSites()).body.find((s: { id: number }) => s.id === site.id)
    expect(listed.tankCount).toBe(2)
    expect((await t.api().get(`/api/v1/sites/${site.id}`).set(owner)).body.tankCount).toBe(2)
    expect((await patchSite(site.id, { notes: 'Busy' })).body.tankCount).toBe(2)
    const other = (await listSites()).body.find((s: { id: number }) => s.id === org.siteIds[0])
    expect(other.tankCount).toBe(0)
  })
})
