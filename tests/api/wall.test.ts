import { get, type IncomingHttpHeaders } from 'node:http'
import { gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import WebSocket from 'ws'
import { MAX_TREND_TANKS, type WallResponse, type WallTrendsResponse } from '@shared/schemas/wall'
import { bearer, sampleTank } from '../helpers/app'
import { createIncidentRow, createTankRow, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Wall Org')
  other = await s.createOrg('Other Wall Org')
})
afterAll(() => s.close())

const api = (path: string, token: string, init: RequestInit = {}) =>
  fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token), ...(init.headers ?? {}) } })

describe('the wall and wall displays', () => {
  it('lists the site tanks with their state, alarm first', async () => {
    const site = org.siteIds[0]
    const calm = await createTankWithDevice(s.ctx, org, 'Calm tank')
    const hot = await createTankWithDevice(s.ctx, org, 'Hot tank')
    await s.ctx.models.Tank.update({ sortOrder: 1 }, { where: { id: calm.tankId } })
    await s.ctx.models.Tank.update({ sortOrder: 2 }, { where: { id: hot.tankId } })
    const now = new Date().toISOString()
    for (const [token, value] of [
      [calm.token, 26],
      [hot.token, 26.1],
    ] as const) {
      await api('/readings', token, {
        method: 'POST',
        body: JSON.stringify({
          v: 1,
          readings: [
            { metric: 'temperature', value, time: now },
            { metric: 'light', value: 8000, time: now },
          ],
        }),
      })
    }
    await createIncidentRow(s.ctx, org, hot.tankId, { siteId: site, firstValue: 28.4, peakValue: 28.4, latestValue: 28.4 })
    const res = await api(`/sites/${site}/wall`, org.users.viewer.token)
    expect(res.status).toBe(200)
    const wall = (await res.json()) as WallResponse
    expect(wall.tanks.map((t) => t.name)).toEqual(['Hot tank', 'Calm tank'])
    expect(wall.tanks[0]).toMatchObject({ state: 'alarm', openIncident: { title: 'Temperature above 28 °C for 10 min', severity: 'alarm' } })
    expect(wall.tanks[1]).toMatchObject({ state: 'steady', lightOn: true, latest: { temperature: { value: 26 } } })
    expect(wall.openIncidents).toBe(1)
    expect(wall.onDuty).toEqual([])
    expect(wall.backupContact).toMatchObject({ userId: org.users.owner.id })
  })

  it('lets an owner create a wall key that can read only its own wall and write nothing', async () => {
    const site = org.siteIds[0]
    const keeperTry = await api(`/sites/${site}/wall-credentials`, org.users.keeper.token, { method: 'POST', body: JSON.stringify({ name: 'Fish room TV' }) })
    expect(keeperTry.status).toBe(403)
    const created = await api(`/sites/${site}/wall-credentials`, org.users.owner.token, { method: 'POST', body: JSON.stringify({ name: 'Fish room TV' }) })
    expect(created.status).toBe(201)
    const { credential, link } = (await created.json()) as { credential: { id: number }; link: string }
    const key = new URL(link, 'http://x').searchParams.get('key')!
    expect(key).toMatch(/^tww_\d+_/)

    const seen = await api(`/sites/${site}/wall`, key)
    expect(seen.status).toBe(200)
    expect(((await seen.json()) as { site: { clockStyle: string } }).site.clockStyle).toBe('24h')
    const twelve = await api('/organization', org.users.owner.token, { method: 'PATCH', body: JSON.stringify({ clockStyle: '12h' }) })
    expect(twelve.status).toBe(200)
    expect(((await (await api(`/sites/${site}/wall`, key)).json()) as { site: { clockStyle: string } }).site.clockStyle).toBe('12h')
    await api('/organization', org.users.owner.token, { method: 'PATCH', body: JSON.stringify({ clockStyle: '24h' }) })
    expect((await api(`/sites/${org.siteIds[1]}/wall`, key)).status).toBe(404)
    expect((await api(`/sites/${other.siteIds[0]}/wall`, key)).status).toBe(404)
    // Nothing else, and no writes.
    for (const [method, path, body] of [
      ['GET', '/tanks', undefined],
      ['GET', `/sites/${site}`, undefined],
      ['GET', '/auth/me', undefined],
      ['GET', '/incidents', undefined],
      ['POST', '/tanks', JSON.stringify(sampleTank(site))],
      ['POST', `/sites/${site}/wall-credentials`, JSON.stringify({ name: 'x' })],
      ['PATCH', `/sites/${site}`, JSON.stringify({ name: 'x' })],
      ['POST', '/readings', JSON.stringify({ v: 1, readings: [] })],
    ] as const) {
      const res = await api(path, key, { method, body })
      expect(res.status, `${method} ${path}`).toBe(401)
    }

    // The live socket accepts the key for its own site only.
    const ws = new WebSocket(`${s.baseUrl.replace('http', 'ws')}/ws`)
    const frames: Array<{ type: string; code?: string; role?: string }> = []
    ws.on('message', (d) => frames.push(JSON.parse(d.toString())))
    await new Promise((r) => ws.once('open', r))
    ws.send(JSON.stringify({ type: 'auth', token: key }))
    ws.send(JSON.stringify({ type: 'subscribe', siteId: org.siteIds[1] }))
    ws.send(JSON.stringify({ type: 'subscribe', siteId: site }))
    await new Promise((r) => setTimeout(r, 500))
    expect(frames[0]).toMatchObject({ type: 'ready', role: 'wall' })
    expect(frames[1]).toMatchObject({ type: 'error', code: 'forbidden' })
    expect(frames[2]).toMatchObject({ type: 'subscribed' })

    const closed = new Promise<number>((r) => ws.once('close', (code) => r(code)))
    const revoked = await api(`/wall-credentials/${credential.id}/revoke`, org.users.owner.token, { method: 'POST' })
    expect(revoked.status).toBe(200)
    expect(await closed).toBe(4401)
    expect((await api(`/sites/${site}/wall`, key)).status).toBe(401)
  })
})

describe('the wall data itself', () => {
  it('sends each tank its temperature trend in 15-minute means, compressed for a client that accepts it', async () => {
    const trendOrg = await s.createOrg('Trend Org')
    const tank = await createTankWithDevice(s.ctx, trendOrg, 'Trend tank')
    // Enough tanks that the answer passes the 1 KB below which compressing is not worth it.
    for (const name of ['Second tank', 'Third tank']) await createTankWithDevice(s.ctx, trendOrg, name)
    const QUARTER = 15 * 60_000
    const base = Math.floor(Date.now() / QUARTER) * QUARTER - 4 * QUARTER
    const readings = [
      [base + 60_000, 25.0],
      [base + 120_000, 25.4],
      [base + QUARTER + 60_000, 26.0],
    ].map(([at, value]) => ({ metric: 'temperature', value, time: new Date(at).toISOString() }))
    expect((await api('/readings', tank.token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })).status).toBe(200)

    const res = await request(`${s.baseUrl}/api/v1/sites/${trendOrg.siteIds[0]}/wall`, {
      'accept-encoding': 'gzip',
      authorization: `Bearer ${trendOrg.users.viewer.token}`,
    })
    expect(res.status).toBe(200)
    expect(res.headers['content-encoding']).toBe('gzip')
    const wall = JSON.parse(gunzipSync(res.body).toString('utf8')) as WallResponse
    expect(Object.fromEntries(wall.tanks.map((t) => [t.name, t.trend]))).toEqual({
      'Trend tank': [
        { t: new Date(base).toISOString(), value: 25.2 },
        { t: new Date(base + QUARTER).toISOString(), value: 26 },
      ],
      'Second tank': [],
      'Third tank': [],
    })
  })

  it('leaves out readings older than six hours and averages at most the first 60 readings of a 15-minute bin', async () => {
    const fastOrg = await s.createOrg('Fast Sensor Org')
    const tank = await createTankWithDevice(s.ctx, fastOrg, 'Fast sensor tank')
    const QUARTER = 15 * 60_000
    const bin = Math.floor(Date.now() / QUARTER) * QUARTER - 2 * QUARTER
    // A reading every 5 s: the first 60 at 25 °C, then 20 at 35 °C that the bin's mean leaves out.
    const fast = Array.from({ length: 80 }, (_, i) => ({ metric: 'temperature', value: i < 60 ? 25 : 35, time: new Date(bin + i * 5000).toISOString() }))
    const old = { metric: 'temperature', value: 20, time: new Date(Date.now() - 7 * 3600_000).toISOString() }
    expect((await api('/readings', tank.token, { method: 'POST', body: JSON.stringify({ v: 1, readings: [old, ...fast] }) })).status).toBe(200)

    const wall = (await (await api(`/sites/${fastOrg.siteIds[0]}/wall`, fastOrg.users.viewer.token)).json()) as WallResponse
    expect(wall.tanks.map((t) => t.trend)).toEqual([[{ t: new Date(bin).toISOString(), value: 25 }]])
  })
})

describe('trend lines a screenful at a time', () => {
  it('sends the trend lines of the first tanks only when asked, and the others by tank on request', async () => {
    const pageOrg = await s.createOrg('Pages Org')
    const site = pageOrg.siteIds[0]!
    const tanks = []
    for (const [i, name] of ['First tank', 'Second tank', 'Third tank'].entries()) {
      const tank = await createTankWithDevice(s.ctx, pageOrg, name)
      await s.ctx.models.Tank.update({ sortOrder: i }, { where: { id: tank.tankId } })
      tanks.push(tank)
    }
    const elsewhere = await createTankRow(s.ctx, pageOrg, { name: 'Other site tank', siteId: pageOrg.siteIds[1]! })
    const QUARTER = 15 * 60_000
    const start = Math.floor(Date.now() / QUARTER) * QUARTER - 2 * QUARTER
    for (const [i, tank] of tanks.entries()) {
      const readings = [{ metric: 'temperature', value: 25 + i, time: new Date(start + 60_000).toISOString() }]
      expect((await api('/readings', tank.token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })).status).toBe(200)
    }
    const token = pageOrg.users.viewer.token

    const wall = (await (await api(`/sites/${site}/wall?trends=1`, token)).json()) as WallResponse
    expect(wall.tanks.map((t) => [t.name, t.trend])).toEqual([
      ['First tank', [{ t: new Date(start).toISOString(), value: 25 }]],
      ['Second tank', null],
      ['Third tank', null],
    ])

    const [, second, third] = tanks
    const res = await api(`/sites/${site}/wall/trends?tankIds=${third!.tankId},${second!.tankId},${elsewhere.id}`, token)
    expect(res.status).toBe(200)
    expect(((await res.json()) as WallTrendsResponse).trends).toEqual([
      { tankId: second!.tankId, trend: [{ t: new Date(start).toISOString(), value: 26 }] },
      { tankId: third!.tankId, trend: [{ t: new Date(start).toISOString(), value: 27 }] },
    ])

    const bad = await api(`/sites/${site}/wall/trends?tankIds=3,x`, token)
    expect(bad.status).toBe(400)
    expect(((await bad.json()) as { error: { fields: Record<string, string> } }).error.fields).toHaveProperty('tankIds')
    const many = Array.from({ length: MAX_TREND_TANKS + 1 }, (_, i) => i + 1).join(',')
    expect((await api(`/sites/${site}/wall/trends?tankIds=${many}`, token)).status).toBe(400)
    expect((await api(`/sites/${site}/wall?trends=-1`, token)).status).toBe(400)
  })
})

/** A GET whose body arrives as sent (fetch would decompress it). */
function request(url: string, headers: Record<string, string>): Promise<{ status: number; headers: IncomingHttpHeaders; body: Buffer }> {
  return new Promise((resolve, reject) => {
    get(url, { headers }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }))
    }).on('error', reject)
  })
}
