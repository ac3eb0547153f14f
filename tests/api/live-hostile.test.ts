import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import WebSocket from 'ws'
import type { LiveServerMessage } from '@shared/schemas/live'
import { CATCH_UP_PAGE_ROWS, CATCH_UP_SPAN_MS } from '../../server/live/catch-up'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { sleep, until } from '../helpers/wait'

// Live sockets that ask too much, read too little, or outlive their grant. Scope at subscribe time,
// revoked sessions and wall keys are in tests/api/security-live.test.ts and tests/api/wall.test.ts.

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
const HOUR = 3600_000

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Marrowfen Live Hostile')
  node = await createTankWithDevice(s.ctx, org, 'Catch-up tank')
  // 2,500 readings over the last 20 hours, and 500 from two to three days ago.
  await s.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'd:' || $2::text, 'temperature', now() - make_interval(secs => i * 28.8), $1::int, 25, 'device' FROM generate_series(1, 2500) i
     UNION ALL
     SELECT 'd:' || $2::text, 'ph', now() - interval '2 days' - make_interval(secs => i * 172.8), $1::int, 7, 'device' FROM generate_series(1, 500) i`,
    { bind: [node.tankId, node.deviceId] },
  )
})
afterAll(() => s.close())

const api = (method: string, path: string, token: string, body?: unknown) =>
  fetch(`${s.baseUrl}/api/v1${path}`, {
    method,
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: body === undefined ? undefined : JSON.stringify(body),
  })

async function liveSocket(token: string) {
  const ws = new WebSocket(`${s.baseUrl.replace('http', 'ws')}/ws`)
  const frames: LiveServerMessage[] = []
  ws.on('message', (d) => frames.push(JSON.parse(d.toString())))
  const closed = new Promise<number>((resolve) => ws.once('close', (code) => resolve(code)))
  await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
  const soon = (check: () => boolean) => until(check, 5000, 20)
  const send = (m: unknown) => ws.send(JSON.stringify(m))
  send({ type: 'auth', token })
  expect(await soon(() => frames.some((f) => f.type === 'ready'))).toBe(true)
  const count = (type: LiveServerMessage['type']) => frames.filter((f) => f.type === type).length
  return { ws, frames, closed, until: soon, send, count }
}

const catchUps = (frames: LiveServerMessage[]) => frames.flatMap((f) => (f.type === 'readings' && f.catchUp ? [f.readings] : []))
const within = <T>(p: Promise<T>, ms: number) => Promise.race([p, new Promise<'timeout'>((r) => setTimeout(() => r('timeout'), ms))])

describe('catch-up on the live socket', () => {
  it('reaches back a day at most and arrives in pages, however far back `since` asks', async () => {
    const c = await liveSocket(org.users.viewer.token)
    const asked = Date.now()
    c.send({ type: 'subscribe', siteId: org.siteIds[0], since: new Date(asked - 300 * 24 * HOUR).toISOString() })
    expect(await c.until(() => catchUps(c.frames).flat().length >= 2500)).toBe(true)
    const pages = catchUps(c.frames)
    expect(pages.map((p) => p.length)).toEqual([CATCH_UP_PAGE_ROWS, CATCH_UP_PAGE_ROWS, 500])
    const times = pages.flat().map((r) => Date.parse(r.time))
    expect(Math.min(...times)).toBeGreaterThanOrEqual(asked - CATCH_UP_SPAN_MS - 60_000)
    expect(times).toEqual([...times].sort((a, b) => a - b))
    c.ws.close()
  })

  it('answers a repeated subscribe without catching up again', async () => {
    const c = await liveSocket(org.users.viewer.token)
    const since = new Date(Date.now() - 300 * 24 * HOUR).toISOString()
    c.send({ type: 'subscribe', siteId: org.siteIds[0], since })
    expect(await c.until(() => catchUps(c.frames).flat().length >= 2500)).toBe(true)
    const pagesAfterFirst = catchUps(c.frames).length
    for (let i = 0; i < 30; i++) c.send({ type: 'subscribe', siteId: org.siteIds[0], since })
    c.send({ type: 'subscribe', tankIds: [node.tankId], since })
    expect(await c.until(() => c.count('subscribed') === 32)).toBe(true)
    expect(catchUps(c.frames)).toHaveLength(pagesAfterFirst)
    c.ws.close()
  })
})

describe('a client that does not read', () => {
  it('is dropped once its unsent backlog passes the limit', async () => {
    const c = await liveSocket(org.users.owner.token)
    c.send({ type: 'subscribe', tankIds: [node.tankId] })
    expect(await c.until(() => c.count('subscribed') === 1)).toBe(true)
    const peers = s.hub.peerCount()
    // Stop reading: what the server sends piles up in the kernel's buffers, then in the server's.
    ;(c.ws as unknown as { _socket: { pause: () => void } })._socket.pause()
    const t0 = Date.now() - HOUR
    for (let batch = 0; batch < 300 && s.hub.peerCount() === peers; batch++) {
      const rows = Array.from({ length: 1000 }, (_, i) => ({
        tankId: node.tankId,
        metric: 'temperature',
        time: new Date(t0 + batch * 1000 + i),
        value: 25.1,
        source: 'device' as const,
      }))
      s.ctx.events.emit('readings.stored', rows)
      await sleep(60) // let the 50 ms coalescing flush it
    }
    expect(s.hub.peerCount()).toBe(peers - 1)
    ;(c.ws as unknown as { _socket: { resume: () => void } })._socket.resume()
    expect(await within(c.closed, 5000)).not.toBe('timeout')
  })
})

describe('open sockets follow changes of access', () => {
  it("stops a viewer's readings from a site the owner takes away", async () => {
    const viewer = await s.ctx.models.User.findByPk(org.users.viewer.id)
    await s.ctx.models.UserSite.create({ userId: viewer!.id, siteId: org.siteIds[0] })
    const c = await liveSocket(org.users.viewer.token)
    c.send({ type: 'subscribe', siteId: org.siteIds[0] })
    expect(await c.until(() => c.count('subscribed') === 1)).toBe(true)
    expect((await api('PATCH', `/users/${viewer!.id}`, org.users.owner.token, { siteIds: [org.siteIds[1]] })).status).toBe(200)
    expect(await c.until(() => c.count('subscribed') === 2)).toBe(true)
    expect(c.frames.filter((f) => f.type === 'subscribed').at(-1)).toEqual({ type: 'subscribed', tankIds: [] })
    const posted = await fetch(`${s.baseUrl}/api/v1/readings`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${node.token}` },
      body: JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 6.8, time: new Date().toISOString() }] }),
    })
    expect(posted.status).toBe(200)
    await sleep(500)
    expect(c.frames.some((f) => f.type === 'readings' && !f.catchUp && f.readings.some((r) => r.value === 6.8))).toBe(false)
    c.ws.close()
    await s.ctx.models.UserSite.destroy({ where: { userId: viewer!.id } })
  })

  it('drops an archived tank from the sockets watching it', async () => {
    const spare = await createTankWithDevice(s.ctx, org, 'Archived spare')
    const c = await liveSocket(org.users.keeper.token)
    c.send({ type: 'subscribe', tankIds: [node.tankId, spare.tankId] })
    expect(await c.until(() => c.count('subscribed') === 1)).toBe(true)
    expect((await api('POST', `/tanks/${spare.tankId}/archive`, org.users.owner.token)).status).toBe(200)
    expect(await c.until(() => c.count('subscribed') === 2)).toBe(true)
    expect(c.frames.filter((f) => f.type === 'subscribed').at(-1)).toEqual({ type: 'subscribed', tankIds: [node.tankId] })
    c.ws.close()
  })

  it('closes the wall display of a site that is archived', async () => {
    const site = await s.ctx.models.Site.create({ organizationId: org.organizationId, name: 'Pop-up stand', timeZone: 'Europe/Berlin' })
    const created = await api('POST', `/sites/${site.id}/wall-credentials`, org.users.owner.token, { name: 'Stand TV' })
    expect(created.status).toBe(201)
    const { link } = (await created.json()) as { link: string }
    const c = await liveSocket(new URL(link, 'http://x').searchParams.get('key')!)
    c.send({ type: 'subscribe', siteId: site.id })
    expect(await c.until(() => c.count('subscribed') === 1)).toBe(true)
    expect((await api('POST', `/sites/${site.id}/archive`, org.users.owner.token)).status).toBe(200)
    expect(await within(c.closed, 2000)).toBe(4401)
  })
})
