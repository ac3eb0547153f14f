import mqtt from 'mqtt'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import WebSocket from 'ws'
import { commandsTopic, readingsTopic } from '@shared/ingest/contract'
import type { LiveServerMessage } from '@shared/schemas/live'
import { createTankRow, createTankWithDevice, TEST_PASSWORD, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { until } from '../helpers/wait'

// Scope and revocation on the live connections. Already covered elsewhere, not repeated here:
// another organization's tank and no-auth subscriptions (tests/api/live.test.ts), a wall key on
// another site and wall key revocation closing its socket (tests/api/wall.test.ts), publishing to
// another device's topic, subscribing to its readings, and the device.revoked event cutting MQTT
// (tests/mqtt/ingest.test.ts, tests/mqtt/outside-client.test.ts).

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let other: TestOrg
let shopTank: Awaited<ReturnType<typeof createTankWithDevice>>
let roomTankId: number

beforeAll(async () => {
  s = await startTestServer({ signInLimit: 1000 })
  org = await s.createOrg('Marrowfen Live Security')
  other = await s.createOrg('Other Live Security')
  shopTank = await createTankWithDevice(s.ctx, org, 'Shop tank')
  const room = await createTankRow(s.ctx, org, {
    siteId: org.siteIds[1],
    name: 'Fish room tank',
    kind: 'coldwater',
    dimensions: null,
    volumeLitres: 120,
    volumeSource: 'entered',
    heater: null,
    lightSchedule: null,
  })
  roomTankId = room.id
})
afterAll(() => s?.close())

const api = (method: string, path: string, token?: string, body?: unknown) =>
  fetch(`${s.baseUrl}/api/v1${path}`, {
    method,
    headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })

async function signIn(email: string) {
  const res = await api('POST', '/auth/sign-in', undefined, { email, password: TEST_PASSWORD })
  expect(res.status).toBe(200)
  return ((await res.json()) as { token: string }).token
}

/** A socket that has authenticated; frames collected in order, with a wait for the close code. */
async function liveSocket(token: string) {
  const ws = new WebSocket(`${s.baseUrl.replace('http', 'ws')}/ws`)
  const frames: LiveServerMessage[] = []
  ws.on('message', (d) => frames.push(JSON.parse(d.toString())))
  const closed = new Promise<number>((resolve) => ws.once('close', (code) => resolve(code)))
  await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
  ws.send(JSON.stringify({ type: 'auth', token }))
  const frame = async (index: number) => {
    await until(() => frames.length > index, 5000, 50)
    return frames[index]
  }
  return { ws, frames, closed, frame, send: (m: unknown) => ws.send(JSON.stringify(m)) }
}

const withTimeout = <T>(p: Promise<T>, ms: number, what: string) =>
  Promise.race([p, new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`${what} did not happen within ${ms} ms`)), ms))])

describe('live subscriptions stay inside the subscriber’s scope', () => {
  it('a viewer limited to one site may not watch the other site, by site or by tank', async () => {
    const viewer = await s.ctx.models.User.findByPk(org.users.viewer.id)
    await s.ctx.models.UserSite.create({ userId: viewer!.id, siteId: org.siteIds[0] })
    const c = await liveSocket(await signIn(org.users.viewer.email))
    expect(await c.frame(0)).toMatchObject({ type: 'ready', role: 'viewer' })
    c.send({ type: 'subscribe', siteId: org.siteIds[1] })
    expect(await c.frame(1)).toMatchObject({ type: 'error', code: 'forbidden' })
    c.send({ type: 'subscribe', tankIds: [roomTankId] })
    expect(await c.frame(2)).toMatchObject({ type: 'error', code: 'forbidden' })
    // A mix of an allowed and a forbidden tank is refused whole, and catch-up sends nothing of it.
    c.send({ type: 'subscribe', tankIds: [shopTank.tankId, roomTankId], since: new Date(0).toISOString() })
    expect(await c.frame(3)).toMatchObject({ type: 'error', code: 'forbidden' })
    c.send({ type: 'subscribe', siteId: org.siteIds[0] })
    expect(await c.frame(4)).toEqual({ type: 'subscribed', tankIds: [shopTank.tankId] })
    c.ws.close()
    await s.ctx.models.UserSite.destroy({ where: { userId: viewer!.id } })
  })

  it('an owner may not watch another organization’s site, and a device token opens no socket', async () => {
    const c = await liveSocket(org.users.owner.token)
    expect(await c.frame(0)).toMatchObject({ type: 'ready', role: 'owner' })
    c.send({ type: 'subscribe', siteId: other.siteIds[0] })
    expect(await c.frame(1)).toMatchObject({ type: 'error', code: 'forbidden' })
    c.ws.close()
    const device = await liveSocket(shopTank.token)
    expect(await withTimeout(device.closed, 5000, 'closing a socket authenticated with a device token')).toBe(4401)
  })
})

describe('revoking a token cuts the live connections it opened', () => {
  it('sign-out closes the socket of that session', async () => {
    const token = await signIn(org.users.keeper.email)
    const c = await liveSocket(token)
    expect(await c.frame(0)).toMatchObject({ type: 'ready' })
    expect((await api('POST', '/auth/sign-out', token)).status).toBe(204)
    expect(await withTimeout(c.closed, 10_000, 'closing the socket after sign-out')).toBe(4401)
  })

  it('deactivating a user closes their sockets', async () => {
    const user = await s.ctx.models.User.create({
      organizationId: org.organizationId,
      email: 'leaver@live-security.example',
      name: 'Leaver',
      role: 'keeper',
      passwordHash: (await s.ctx.models.User.findByPk(org.users.keeper.id))!.passwordHash,
    })
    const c = await liveSocket(await signIn(user.email))
    expect(await c.frame(0)).toMatchObject({ type: 'ready' })
    expect((await api('PATCH', `/users/${user.id}`, org.users.owner.token, { active: false })).status).toBe(200)
    expect(await withTimeout(c.closed, 10_000, 'closing the socket after deactivation')).toBe(4401)
  })

  it('revoking a device through the API closes its MQTT connection and its token is refused afterwards', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Revoked by API')
    const client = await mqtt.connectAsync(s.mqttUrl, {
      username: String(node.deviceId),
      password: node.token,
      reconnectPeriod: 0,
      clientId: `sec-${Math.random()}`,
    })
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    expect((await api('POST', `/devices/${node.deviceId}/revoke`, org.users.owner.token)).status).toBe(200)
    await withTimeout(closed, 10_000, 'closing the MQTT connection after revocation')
    client.end(true)
    await expect(
      mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0, connectTimeout: 5000 }),
    ).rejects.toThrow(/Bad username or password|Not authorized/i)
    const http = await api('POST', '/readings', node.token, { v: 1, readings: [{ metric: 'ph', value: 7, time: new Date().toISOString() }] })
    expect(http.status).toBe(401)
  })

  it('rotating a device token cuts the connection that used the old one', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Rotated by API')
    const client = await mqtt.connectAsync(s.mqttUrl, {
      username: String(node.deviceId),
      password: node.token,
      reconnectPeriod: 0,
      clientId: `sec-${Math.random()}`,
    })
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    const rotated = await api('POST', `/devices/${node.deviceId}/rotate`, org.users.owner.token)
    expect(rotated.status).toBe(200)
    await withTimeout(closed, 10_000, 'closing the MQTT connection after rotation')
    client.end(true)
    await expect(
      mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0, connectTimeout: 5000 }),
    ).rejects.toThrow(/Bad username or password|Not authorized/i)
  })
})

describe('MQTT credentials and topic ACLs', () => {
  it('a person’s token or a wall key is no device password', async () => {
    for (const password of [org.users.owner.token, 'tww_1_' + 'x'.repeat(40)]) {
      await expect(mqtt.connectAsync(s.mqttUrl, { username: String(shopTank.deviceId), password, reconnectPeriod: 0, connectTimeout: 5000 })).rejects.toThrow(
        /Bad username or password|Not authorized/i,
      )
    }
  })

  it('a device may subscribe to no other device’s commands and to no wildcard', async () => {
    const neighbour = await createTankWithDevice(s.ctx, org, 'Neighbour tank')
    const client = await mqtt.connectAsync(s.mqttUrl, {
      username: String(shopTank.deviceId),
      password: shopTank.token,
      reconnectPeriod: 0,
      clientId: `sec-${Math.random()}`,
    })
    for (const topic of [
      commandsTopic(neighbour.deviceId),
      '#',
      'tankwarden/#',
      'tankwarden/v1/devices/+/commands',
      '$SYS/#',
      readingsTopic(shopTank.deviceId),
    ]) {
      await expect(client.subscribeAsync(topic, { qos: 1 }), topic).rejects.toThrow(/Subscribe error/)
    }
    expect((await client.subscribeAsync(commandsTopic(shopTank.deviceId), { qos: 1 }))[0].qos).toBe(1)
    await client.endAsync()
  })
})
