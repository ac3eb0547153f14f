import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, type TestOrg } from '../helpers/app'
import { createTankWithDevice } from '../helpers/fixtures'
import { openLiveClient } from '../helpers/live-client'
import { startTestServer } from '../helpers/server'

// A client's person sees exactly the client's tanks, at two sites, and nothing else of those sites.
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let dataDir: string
let clientId: number
let clientToken: string
let clientUserEmail: string
const tanks = { mineA: 0, mineB: 0, otherA: 0, otherB: 0 }
const devices = { mineA: '', otherA: '' }
const photos = { mineA: 0, otherA: 0 }

async function call(method: string, path: string, token: string, body?: unknown) {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, {
    method: method.toUpperCase(),
    headers: { ...bearer(token), ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })
  const type = res.headers.get('content-type') ?? ''
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- each test reads the fields it checks
  return { status: res.status, type, body: (type.includes('json') ? await res.json() : await res.text()) as any }
}
const owner = () => org.users.owner.token

async function uploadPhoto(tankId: number) {
  const image = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#2a7' } })
    .jpeg()
    .toBuffer()
  const form = new FormData()
  form.append('photo', new Blob([new Uint8Array(image)], { type: 'image/jpeg' }), 'glass.jpg')
  const res = await fetch(`${s.baseUrl}/api/v1/tanks/${tankId}/photos`, { method: 'POST', headers: bearer(owner()), body: form })
  expect(res.status).toBe(201)
  return ((await res.json()) as { id: number }).id
}

const postReading = (token: string, value: number) =>
  fetch(`${s.baseUrl}/api/v1/readings`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value, time: new Date().toISOString() }] }),
  })

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-client-scope-'))
  s = await startTestServer({ dataDir })
  org = await s.createOrg('Client Scope Org')
  const created = await call('post', '/clients', owner(), { kind: 'company', name: 'Harbour Dental', email: 'front@harbour.example' })
  expect(created.status).toBe(201)
  clientId = created.body.id
  const a = await createTankWithDevice(s.ctx, org, 'Waiting room reef')
  const o = await createTankWithDevice(s.ctx, org, 'Shop display')
  tanks.mineA = a.tankId
  tanks.otherA = o.tankId
  devices.mineA = a.token
  devices.otherA = o.token
  const b = await call('post', '/tanks', owner(), sampleTank(org.siteIds[1], { name: 'Surgery hall tank', clientId }))
  expect(b.status).toBe(201)
  tanks.mineB = b.body.id
  tanks.otherB = (await call('post', '/tanks', owner(), sampleTank(org.siteIds[1], { name: 'Fish room quarantine' }))).body.id
  expect((await call('patch', `/tanks/${tanks.mineA}`, owner(), { clientId })).body.clientName).toBe('Harbour Dental')

  // The client's person comes in through an invitation naming the client.
  clientUserEmail = 'dr.lindqvist@harbour.example'
  const invite = await call('post', '/users/invitations', owner(), { email: clientUserEmail, name: 'Dr Lindqvist', role: 'viewer', clientId })
  expect(invite.status).toBe(201)
  expect(invite.body.invitation.clientId).toBe(clientId)
  const token = new URL(invite.body.link, 'http://x').searchParams.get('token')!
  const accepted = await call('post', '/invitations/accept', '', { token, password: 'a-long-enough-password' })
  expect(accepted.status).toBe(201)
  expect(accepted.body.user).toMatchObject({ role: 'viewer', clientId, siteIds: [] })
  clientToken = accepted.body.token
  photos.mineA = await uploadPhoto(tanks.mineA)
  photos.otherA = await uploadPhoto(tanks.otherA)
})
afterAll(async () => {
  await s?.close()
  rmSync(dataDir, { recursive: true, force: true })
})

describe("a client's viewer", () => {
  it('lists exactly the two tanks of the client, across two sites, with a site filter narrowing them', async () => {
    const all = await call('get', '/tanks', clientToken)
    expect(all.status).toBe(200)
    expect(all.body.items.map((t: { id: number }) => t.id).sort()).toEqual([tanks.mineA, tanks.mineB].sort())
    expect(new Set(all.body.items.map((t: { siteId: number }) => t.siteId))).toEqual(new Set(org.siteIds))
    const atA = await call('get', `/tanks?siteId=${org.siteIds[0]}`, clientToken)
    expect(atA.body.items.map((t: { id: number }) => t.id)).toEqual([tanks.mineA])
    expect((await call('get', `/tanks/${tanks.mineB}`, clientToken)).status).toBe(200)
    for (const id of [tanks.otherA, tanks.otherB]) expect((await call('get', `/tanks/${id}`, clientToken)).status).toBe(404)
  })

  it('sees no whole site: no sites, walls, incidents, devices of other tanks, site reports or site exports', async () => {
    expect((await call('get', '/sites', clientToken)).body).toEqual([])
    expect((await call('get', `/sites/${org.siteIds[0]}`, clientToken)).status).toBe(404)
    expect((await call('get', `/sites/${org.siteIds[0]}/wall`, clientToken)).status).toBe(404)
    expect((await call('get', '/incidents', clientToken)).body.items).toEqual([])
    const devicesSeen = (await call('get', '/devices', clientToken)).body as Array<{ tankId: number }>
    expect(devicesSeen.map((d) => d.tankId)).toEqual([tanks.mineA])
    expect((await call('get', `/sites/${org.siteIds[0]}/report`, clientToken)).status).toBe(404)
    expect((await call('get', `/sites/${org.siteIds[0]}/exports/readings.csv?from=2026-03-01T00:00:00Z&to=2026-04-01T00:00:00Z`, clientToken)).status).toBe(404)
    expect((await call('get', '/clients', clientToken)).status).toBe(403)
    expect((await call('get', '/overview', clientToken)).status).toBe(403)
  })

  it('reads charts and latest values of its tanks only', async () => {
    expect((await postReading(devices.mineA, 25.4)).status).toBe(200)
    expect((await postReading(devices.otherA, 26.1)).status).toBe(200)
    const mine = await call('get', `/tanks/${tanks.mineA}/series?metric=temperature`, clientToken)
    expect(mine.status).toBe(200)
    expect((await call('get', `/tanks/${tanks.mineA}/latest`, clientToken)).status).toBe(200)
    for (const path of [`/tanks/${tanks.otherA}/series?metric=temperature`, `/tanks/${tanks.otherA}/latest`, `/tanks/${tanks.otherA}/test-kit-entries`]) {
      expect((await call('get', path, clientToken)).status, path).toBe(404)
    }
  })

  it('reports: its tanks and its client report, never another tank or client', async () => {
    const report = await call('get', `/clients/${clientId}/report`, clientToken)
    expect(report.status).toBe(200)
    expect(report.body.subject).toMatchObject({ kind: 'client', name: 'Harbour Dental' })
    expect(report.body.tanks.map((t: { name: string }) => t.name).sort()).toEqual(['Surgery hall tank', 'Waiting room reef'])
    const pdf = await call('get', `/clients/${clientId}/report/pdf`, clientToken)
    expect(pdf.status).toBe(200)
    expect(pdf.type).toBe('application/pdf')
    expect((await call('get', `/tanks/${tanks.mineB}/report`, clientToken)).status).toBe(200)
    expect((await call('get', `/tanks/${tanks.otherB}/report`, clientToken)).status).toBe(404)
    const stranger = await call('post', '/clients', owner(), { kind: 'person', name: 'Someone Else' })
    expect((await call('get', `/clients/${stranger.body.id}/report`, clientToken)).status).toBe(404)
    // A viewer of every site sees the client's report too.
    expect((await call('get', `/clients/${clientId}/report`, org.users.viewer.token)).status).toBe(200)
  })

  it('exports its tanks only', async () => {
    const day = (offset: number) => new Date(Math.floor(Date.now() / 86400_000 + offset) * 86400_000).toISOString()
    const range = `from=${day(-1)}&to=${day(1)}`
    const mine = await call('get', `/tanks/${tanks.mineA}/exports/readings.csv?${range}`, clientToken)
    expect(mine.status, String(mine.body)).toBe(200)
    expect(mine.body).toContain('25.4')
    expect((await call('get', `/tanks/${tanks.otherA}/exports/readings.csv?${range}`, clientToken)).status).toBe(404)
  })

  it('sees the photos of its tanks only', async () => {
    const mine = await call('get', `/tanks/${tanks.mineA}/photos`, clientToken)
    expect(mine.status).toBe(200)
    expect(JSON.stringify(mine.body)).toContain(`"id":${photos.mineA}`)
    expect((await call('get', `/photos/${photos.mineA}/thumbnail`, clientToken)).status).toBe(200)
    expect((await call('get', `/tanks/${tanks.otherA}/photos`, clientToken)).status).toBe(404)
    for (const path of [`/photos/${photos.otherA}`, `/photos/${photos.otherA}/image`, `/photos/${photos.otherA}/thumbnail`]) {
      expect((await call('get', path, clientToken)).status, path).toBe(404)
    }
  })

  it('watches its tanks live and is refused the others; a site subscription gives only its tank there', async () => {
    const live = await openLiveClient(s.baseUrl)
    try {
      live.send({ type: 'auth', token: clientToken })
      await live.next((m) => m.type === 'ready')
      live.send({ type: 'subscribe', tankIds: [tanks.otherA] })
      expect(await live.next((m) => m.type === 'error')).toMatchObject({ code: 'forbidden' })
      live.send({ type: 'subscribe', siteId: org.siteIds[0] })
      expect(await live.next((m) => m.type === 'subscribed')).toMatchObject({ tankIds: [tanks.mineA] })
      await postReading(devices.otherA, 27.7)
      await postReading(devices.mineA, 25.9)
      await live.next((m) => m.type === 'readings' && m.readings.some((r) => r.value === 25.9))
      expect(live.liveReadings().map((r) => r.tankId)).not.toContain(tanks.otherA)
    } finally {
      await live.close()
    }
  })

  it('a site-limited viewer keeps seeing every tank of its site, the client or not', async () => {
    await s.ctx.models.UserSite.create({ userId: org.users.viewer.id, siteId: org.siteIds[0] })
    const res = await call('get', '/tanks', org.users.viewer.token)
    expect(res.body.items.map((t: { id: number }) => t.id).sort()).toEqual([tanks.mineA, tanks.otherA].sort())
    await s.ctx.models.UserSite.destroy({ where: { userId: org.users.viewer.id } })
  })

  it("a client report schedule mails all the client's tanks in one report to the client's person", async () => {
    const user = await s.ctx.models.User.findOne({ where: { email: clientUserEmail } })
    const created = await call('post', '/report-schedules', owner(), { clientId, period: 'week', userIds: [user!.id] })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body).toMatchObject({ clientId, subjectName: 'Harbour Dental' })
    // A site-limited viewer is not the client's, so cannot receive it.
    await s.ctx.models.UserSite.create({ userId: org.users.viewer.id, siteId: org.siteIds[0] })
    const refused = await call('post', '/report-schedules', owner(), { clientId, period: 'week', userIds: [org.users.viewer.id] })
    expect(refused.status).toBe(400)
    const sent = await call('post', `/report-schedules/${created.body.id}/send-now`, owner())
    expect(sent.body.queued).toBe(1)
    const mails = await s.ctx.models.OutboxMessage.findAll({ where: { kind: 'report' } })
    expect(mails.map((m) => m.toAddress)).toEqual([clientUserEmail])
    expect(mails[0].subject).toContain('Harbour Dental')
  })
})
