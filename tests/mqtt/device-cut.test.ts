import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readingsTopic } from '@shared/ingest/contract'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { sleep } from '../helpers/wait'

// What a device keeps after losing its grant. The revocation event cutting the connection and a
// revoked token refused at CONNECT are in tests/mqtt/ingest.test.ts.

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Marrowfen Device Cut')
})
afterAll(() => s.close())

const connect = (node: { deviceId: number; token: string }, options: mqtt.IClientOptions = {}) =>
  mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0, clientId: `cut-${Math.random()}`, ...options })

const owner = (method: string, path: string) => fetch(`${s.baseUrl}/api/v1${path}`, { method, headers: { authorization: `Bearer ${org.users.owner.token}` } })

async function storedCount(tankId: number) {
  const [row] = await s.ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
    bind: [tankId],
    type: QueryTypes.SELECT,
  })
  return row.n
}

const reading = (value: number) => JSON.stringify({ v: 1, readings: [{ metric: 'ph', value, time: new Date(Date.now() - 10_000).toISOString() }] })

describe('a device that loses its grant', () => {
  it('does not have its will message stored once it is revoked', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Will tank')
    const client = await connect(node, { will: { topic: readingsTopic(node.deviceId), payload: Buffer.from(reading(6.6)), qos: 1, retain: false } })
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    expect((await owner('POST', `/devices/${node.deviceId}/revoke`)).status).toBe(200)
    await closed
    client.end(true)
    await sleep(500) // the will would be stored by the 20 ms batch writer well within this
    expect(await storedCount(node.tankId)).toBe(0)
  })

  it('is cut off when its tank is archived, and stores nothing more', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Archived tank')
    const client = await connect(node)
    await client.publishAsync(readingsTopic(node.deviceId), reading(7.0), { qos: 1 })
    expect(await storedCount(node.tankId)).toBe(1)
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    expect((await owner('POST', `/tanks/${node.tankId}/archive`)).status).toBe(200)
    await Promise.race([closed, sleep(2000)])
    // A closed MQTT.js client keeps the message queued; give it the time a stored reading would take.
    await Promise.race([client.publishAsync(readingsTopic(node.deviceId), reading(7.1), { qos: 1 }).catch(() => undefined), sleep(1000)])
    client.end(true)
    await sleep(300)
    expect(client.connected).toBe(false)
    expect(await storedCount(node.tankId)).toBe(1)
  })

  it("cannot throw another device off by connecting with that device's client id", async () => {
    const first = await createTankWithDevice(s.ctx, org, 'Client id tank')
    const second = await createTankWithDevice(s.ctx, org, 'Intruder tank')
    const victim = await connect(first, { clientId: 'shop-node-7' })
    let victimClosed = false
    victim.on('close', () => (victimClosed = true))
    const intruder = await connect(second, { clientId: 'shop-node-7' })
    await sleep(500)
    expect(victimClosed).toBe(false)
    await victim.publishAsync(readingsTopic(first.deviceId), reading(7.2), { qos: 1 })
    expect(await storedCount(first.tankId)).toBe(1)
    await intruder.endAsync()
    await victim.endAsync()
  })

  it('still lets a device replace its own earlier connection by client id', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Reconnecting tank')
    const old = await connect(node, { clientId: 'same-node' })
    const oldClosed = new Promise<void>((resolve) => old.once('close', () => resolve()))
    const fresh = await connect(node, { clientId: 'same-node' })
    await oldClosed
    old.end(true)
    await fresh.publishAsync(readingsTopic(node.deviceId), reading(7.3), { qos: 1 })
    expect(await storedCount(node.tankId)).toBe(1)
    await fresh.endAsync()
  })
})
