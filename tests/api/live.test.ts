import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import WebSocket from 'ws'
import type { LiveServerMessage } from '@shared/schemas/live'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let otherOrg: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let foreign: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Live Org')
  otherOrg = await s.createOrg('Other Live Org')
  node = await createTankWithDevice(s.ctx, org, 'Live tank')
  foreign = await createTankWithDevice(s.ctx, otherOrg, 'Foreign tank')
})
afterAll(() => s.close())

/** A ws client that collects frames and can wait for one matching a predicate. */
async function openSocket() {
  const ws = new WebSocket(`${s.baseUrl.replace('http', 'ws')}/ws`)
  const frames: LiveServerMessage[] = []
  const waiters: Array<{ match: (m: LiveServerMessage) => boolean; resolve: (m: LiveServerMessage) => void }> = []
  ws.on('message', (data) => {
    const message = JSON.parse(data.toString()) as LiveServerMessage
    frames.push(message)
    for (const w of [...waiters])
      if (w.match(message)) {
        waiters.splice(waiters.indexOf(w), 1)
        w.resolve(message)
      }
  })
  await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
  const next = (match: (m: LiveServerMessage) => boolean, timeoutMs = 5000) =>
    new Promise<LiveServerMessage>((resolve, reject) => {
      const found = frames.find(match)
      if (found) return resolve(found)
      waiters.push({ match, resolve })
      setTimeout(() => reject(new Error('no such frame in time')), timeoutMs)
    })
  const send = (m: unknown) => ws.send(JSON.stringify(m))
  return { ws, frames, next, send }
}

const postReading = (token: string, value: number, time = new Date().toISOString()) =>
  fetch(`${s.baseUrl}/api/v1/readings`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value, time }] }),
  })

describe('live push over a real WebSocket', () => {
  it('pushes a new reading to a subscribed client', async () => {
    const c = await openSocket()
    c.send({ type: 'auth', token: org.users.viewer.token })
    expect(await c.next((m) => m.type === 'ready')).toMatchObject({ role: 'viewer' })
    c.send({ type: 'subscribe', tankIds: [node.tankId] })
    expect(await c.next((m) => m.type === 'subscribed')).toEqual({ type: 'subscribed', tankIds: [node.tankId] })
    expect((await postReading(node.token, 26.4)).status).toBe(200)
    const frame = await c.next((m) => m.type === 'readings')
    expect(frame).toMatchObject({ type: 'readings', readings: [{ tankId: node.tankId, metric: 'temperature', value: 26.4, source: 'device' }] })
    c.ws.close()
  })

  it('catches up from the last time the client saw', async () => {
    const before = new Date(Date.now() - 5000).toISOString()
    await postReading(node.token, 26.7, new Date(Date.now() - 2000).toISOString())
    const c = await openSocket()
    c.send({ type: 'auth', token: org.users.keeper.token })
    await c.next((m) => m.type === 'ready')
    c.send({ type: 'subscribe', siteId: org.siteIds[0], since: before })
    const frame = await c.next((m) => m.type === 'readings' && m.catchUp === true)
    expect(frame.type === 'readings' && frame.readings.map((r) => r.value)).toContain(26.7)
    c.ws.close()
  })

  it("refuses another organization's tank and unauthenticated subscriptions", async () => {
    const c = await openSocket()
    c.send({ type: 'auth', token: org.users.owner.token })
    await c.next((m) => m.type === 'ready')
    c.send({ type: 'subscribe', tankIds: [foreign.tankId] })
    expect(await c.next((m) => m.type === 'error')).toMatchObject({ code: 'forbidden' })
    c.ws.close()

    const anonymous = await openSocket()
    const closed = new Promise<number>((resolve) => anonymous.ws.once('close', (code) => resolve(code)))
    anonymous.send({ type: 'subscribe', tankIds: [node.tankId] })
    expect(await closed).toBe(4401)
  })

  it('closes with 4401 for a bad token', async () => {
    const c = await openSocket()
    const closed = new Promise<number>((resolve) => c.ws.once('close', (code) => resolve(code)))
    c.send({ type: 'auth', token: 'not-a-valid-token-at-all' })
    expect(await closed).toBe(4401)
  })
})
