import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'
import { createIncidentRow, createTankWithDevice } from '../helpers/fixtures'

// Organization isolation on the list routes and their filters, and injection strings kept as text.
// Already covered, not repeated: every detail and write route answering 404 to another
// organization's owner (tests/api/route-roles.test.ts, caller `otherOrg`), sites, tanks, users and
// invitations lists and site-limited viewers (tests/api/tenancy.test.ts).

let t: Awaited<ReturnType<typeof startTestApp>>
let alpha: TestOrg
let beta: TestOrg
const rows = { betaTank: 0, betaDevice: 0, betaIncident: 0, betaMail: 0, alphaTank: 0, alphaIncident: 0 }

const get = (path: string, token: string) => t.api().get(`/api/v1${path}`).set(bearer(token))
const post = (path: string, token: string, body: unknown) =>
  t
    .api()
    .post(`/api/v1${path}`)
    .set(bearer(token))
    .send(body as object)

async function incidentOn(org: TestOrg, tankId: number, title: string) {
  const incident = await createIncidentRow(t.ctx, org, tankId, { title, firstValue: 29, peakValue: 29, latestValue: 29 })
  return incident.id
}

beforeAll(async () => {
  t = await startTestApp()
  alpha = await t.createOrg('Alpha Isolation')
  beta = await t.createOrg('Beta Isolation')
  const a = await createTankWithDevice(t.ctx, alpha, 'Alpha tank')
  const b = await createTankWithDevice(t.ctx, beta, 'Beta tank')
  rows.alphaTank = a.tankId
  rows.betaTank = b.tankId
  rows.betaDevice = b.deviceId
  rows.alphaIncident = await incidentOn(alpha, a.tankId, 'Alpha too warm')
  rows.betaIncident = await incidentOn(beta, b.tankId, 'Beta too warm')
  const mail = await t.ctx.models.FakeMailboxMessage.create({
    organizationId: beta.organizationId,
    envelopeFrom: 'alerts@tankwarden.invalid',
    envelopeTo: [beta.users.owner.email],
    subject: 'Beta alarm',
    textBody: 'Beta only',
    htmlBody: null,
    headers: {},
    attachments: [],
    rawSize: 50,
  })
  rows.betaMail = mail.id
  expect(
    (await post(`/tanks/${b.tankId}/care-tasks`, beta.users.owner.token, { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 1 } })).status,
  ).toBe(201)
  expect((await post(`/tanks/${b.tankId}/test-kit-entries`, beta.users.keeper.token, { values: [{ metric: 'ph', value: 7, unit: 'pH' }] })).status).toBe(201)
})
afterAll(() => t?.close())

describe('list routes never show another organization’s rows, whatever the filter names', () => {
  it('devices: the list and a filter by the other organization’s tank', async () => {
    const list = await get('/devices', alpha.users.owner.token)
    expect(list.status).toBe(200)
    const items = (Array.isArray(list.body) ? list.body : list.body.items) as Array<{ id: number; tankId: number }>
    expect(items.map((d) => d.tankId)).toEqual([rows.alphaTank])
    const filtered = await get(`/devices?tankId=${rows.betaTank}`, alpha.users.owner.token)
    expect(filtered.status).toBe(404)
    expect(filtered.body.error.code).toBe('not_found')
  })

  it('incidents: the list and filters by the other organization’s site and tank', async () => {
    const list = await get('/incidents?pageSize=200', alpha.users.owner.token)
    expect(list.status).toBe(200)
    expect(list.body.items.map((i: { id: number }) => i.id)).toEqual([rows.alphaIncident])
    for (const query of [`tankId=${rows.betaTank}`, `siteId=${beta.siteIds[0]}`, `siteId=${beta.siteIds[0]}&tankId=${rows.betaTank}`]) {
      const res = await get(`/incidents?${query}`, alpha.users.owner.token)
      expect(res.status, query).toBe(200)
      expect(res.body.items, query).toEqual([])
      expect(res.body.total, query).toBe(0)
    }
  })

  it('care today for the other organization’s site is not found, and the own site lists only its own tanks', async () => {
    const foreign = await get(`/care/today?siteId=${beta.siteIds[0]}`, alpha.users.owner.token)
    expect(foreign.status).toBe(404)
    const own = await get(`/care/today?siteId=${alpha.siteIds[0]}`, alpha.users.owner.token)
    expect(own.status).toBe(200)
    expect(JSON.stringify(own.body)).not.toContain('Beta')
    const mine = await get('/care/today?mine=true', alpha.users.owner.token)
    expect(mine.status).toBe(200)
    expect(JSON.stringify(mine.body)).not.toContain('Beta')
  })

  it('the development mailbox shows only the own organization’s mail', async () => {
    const list = await get('/dev/mail', alpha.users.owner.token)
    expect(list.status).toBe(200)
    expect(list.body.items.map((m: { id: number }) => m.id)).not.toContain(rows.betaMail)
    expect((await get(`/dev/mail/${rows.betaMail}`, alpha.users.owner.token)).status).toBe(404)
    expect((await t.api().delete('/api/v1/dev/mail').set(bearer(alpha.users.owner.token))).status).toBe(204)
    expect(await t.ctx.models.FakeMailboxMessage.findByPk(rows.betaMail)).not.toBeNull()
  })

  it('the other organization’s tank in a live list or series filter is not found', async () => {
    for (const path of [
      `/tanks/${rows.betaTank}/latest`,
      `/tanks/${rows.betaTank}/care-tasks`,
      `/tanks/${rows.betaTank}/test-kit-entries`,
      `/tanks/${rows.betaTank}/livestock`,
    ]) {
      const res = await get(path, alpha.users.owner.token)
      expect(res.status, path).toBe(404)
    }
  })
})

const INJECTIONS = [
  "Robert'); DROP TABLE tanks;--",
  "' OR '1'='1",
  '"; DELETE FROM users WHERE ""="',
  '1; SELECT pg_sleep(5)--',
  "x' UNION SELECT password_hash FROM users--",
  '$1 $$ :name ?',
  "\\'; --",
  '%_%',
]

describe('SQL injection strings are stored as text and read back equal', () => {
  it.each(INJECTIONS)('%s', async (text) => {
    const owner = alpha.users.owner.token
    const site = await post('/sites', owner, { name: text, timeZone: 'Europe/Berlin', notes: text })
    expect(site.status).toBe(201)
    const tank = await post('/tanks', owner, sampleTank(site.body.id, { name: text, notes: text, filter: text }))
    expect(tank.status).toBe(201)
    const device = await post('/devices', owner, { tankId: tank.body.id, name: text, metrics: ['ph'], intervalSeconds: 60 })
    expect(device.status).toBe(201)
    const rule = await post(`/tanks/${tank.body.id}/rules`, owner, { name: text, severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6 } })
    expect(rule.status).toBe(201)
    const kit = await post(`/tanks/${tank.body.id}/test-kit-entries`, owner, { values: [{ metric: 'ph', value: 7, unit: 'pH' }], notes: text })
    expect(kit.status).toBe(201)

    const readSite = await get(`/sites/${site.body.id}`, owner)
    expect([readSite.body.name, readSite.body.notes]).toEqual([text, text])
    const readTank = await get(`/tanks/${tank.body.id}`, owner)
    expect([readTank.body.name, readTank.body.notes, readTank.body.filter]).toEqual([text, text, text])
    expect((await get(`/devices/${device.body.device.id}`, owner)).body.name).toBe(text)
    expect((await get(`/tanks/${tank.body.id}/rules`, owner)).body.map((r: { name: string }) => r.name)).toContain(text)
    const entries = await get(`/tanks/${tank.body.id}/test-kit-entries`, owner)
    expect((Array.isArray(entries.body) ? entries.body : entries.body.items)[0].notes).toBe(text)

    // Searching for it finds exactly that tank: the text is matched literally, wildcards included.
    const search = await get(`/tanks?search=${encodeURIComponent(text)}&pageSize=200`, owner)
    expect(search.status).toBe(200)
    expect(search.body.items.map((i: { name: string }) => i.name)).toEqual([text])
    // Nothing was dropped or deleted along the way.
    expect(await t.ctx.models.User.count()).toBeGreaterThanOrEqual(6)
    expect((await get(`/tanks/${rows.alphaTank}`, owner)).status).toBe(200)
  })
})
