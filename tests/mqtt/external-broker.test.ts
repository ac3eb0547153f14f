import { execFile } from 'node:child_process'
import { promisify } from 'node:util'
import mqtt, { type MqttClient } from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { SHARED_READINGS_FILTER } from '../../server/mqtt/external'
import { startServer, type RunningServer } from '../../server/server'
import { readingsTopic } from '@shared/ingest/contract'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice } from '../helpers/fixtures'
import { DEPLOYMENT_ACL, startMosquitto, type MosquittoUser, type RunningMosquitto } from '../helpers/mosquitto'
import { sleep, until } from '../helpers/wait'

const run = promisify(execFile)
const APP: MosquittoUser = { username: 'tankwarden-app', password: 'app-secret-for-the-test-broker' }

let db: Awaited<ReturnType<typeof createTestDatabase>>
let ctx: AppContext
let broker: RunningMosquitto
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let other: Awaited<ReturnType<typeof createTankWithDevice>>
const running: RunningServer[] = []

async function start(instanceId: string) {
  const server = await startServer(
    testConfig({
      databaseUrl: db.url,
      instanceId,
      mqtt: { url: broker.url(APP), host: '127.0.0.1', port: 0 },
      mail: { fakeSmtpPort: 0, from: 'ext@tankwarden.invalid' },
    }),
  )
  running.push(server)
  return server
}
async function stop(server: RunningServer) {
  await server.stop()
  running.splice(running.indexOf(server), 1)
}

const rowsOf = (tankId: number) =>
  ctx.sequelize.query<{ value: number; time: Date }>(`SELECT value, time FROM readings WHERE tank_id = $1 ORDER BY time`, {
    bind: [tankId],
    type: QueryTypes.SELECT,
  })

// Model classes are bound to the last Sequelize that initialised them (a running instance's), so the test reads with SQL.
const deviceStatus = async (deviceId: number) =>
  (
    await ctx.sequelize.query<{ rejected_count: string; last_error: string | null }>(`SELECT rejected_count, last_error FROM devices WHERE id = $1`, {
      bind: [deviceId],
      type: QueryTypes.SELECT,
    })
  )[0]

/** Debian's mosquitto_pub with a device's credentials, as the deployment notes show it. */
const mosquittoPub = (user: number, token: string, topic: string, message: string) =>
  run(
    'mosquitto_pub',
    ['-h', '127.0.0.1', '-p', String(broker.port), '-V', 'mqttv311', '-u', String(user), '-P', token, '-q', '1', '-t', topic, '-m', message],
    {
      timeout: 10_000,
    },
  )
    .then(() => ({ ok: true, stderr: '' }))
    .catch((error: { stderr?: string }) => ({ ok: false, stderr: error.stderr ?? '' }))

const message = (value: number, time: number, metric = 'temperature') =>
  JSON.stringify({ v: 1, readings: [{ metric, value, time: new Date(time).toISOString() }] })

async function deviceClient(device: { deviceId: number; token: string }): Promise<MqttClient> {
  return mqtt.connectAsync(broker.url({ username: String(device.deviceId), password: device.token }), {
    clientId: `device-${device.deviceId}-${Date.now()}`,
    reconnectPeriod: 0,
  })
}

beforeAll(async () => {
  db = await createTestDatabase()
  // Devices exist before the broker starts: its password file holds their tokens.
  ctx = createContext(testConfig({ databaseUrl: db.url }))
  const org = await createOrgIn(ctx, 'External Broker Org')
  node = await createTankWithDevice(ctx, org, 'Broker tank')
  other = await createTankWithDevice(ctx, org, 'Broker neighbour')
  broker = await startMosquitto({
    users: [APP, { username: String(node.deviceId), password: node.token }, { username: String(other.deviceId), password: other.token }],
    acl: DEPLOYMENT_ACL(APP.username),
  })
}, 30_000)

afterAll(async () => {
  for (const server of [...running].reverse()) await server.stop()
  await broker?.stop()
  await closeContext(ctx)
  await db?.drop()
})

describe('MQTT_URL mode against mosquitto', () => {
  it('stores a reading published by mosquitto_pub with the device credentials, once', async () => {
    const app = await start('ext-a')
    expect(app.broker).toBeNull()
    const time = Date.now() - 60_000
    const result = await mosquittoPub(node.deviceId, node.token, readingsTopic(node.deviceId), message(25.8, time))
    expect(result.ok).toBe(true)
    expect(await until(async () => (await rowsOf(node.tankId)).length === 1)).toBe(true)
    // The same message again (a device retrying after a lost PUBACK) is a duplicate.
    expect((await mosquittoPub(node.deviceId, node.token, readingsTopic(node.deviceId), message(25.8, time))).ok).toBe(true)
    await sleep(500)
    const rows = await rowsOf(node.tankId)
    expect(rows.map((r) => [r.value, r.time.getTime()])).toEqual([[25.8, time]])
    await stop(app)
  })

  it('leaves device authentication and topic rules to the broker: wrong token refused, foreign topic not delivered', async () => {
    const app = await start('ext-a')
    const wrong = await mosquittoPub(node.deviceId, `twd_${node.deviceId}_${'w'.repeat(43)}`, readingsTopic(node.deviceId), message(20, Date.now()))
    expect(wrong.ok).toBe(false)
    expect(wrong.stderr).toMatch(/not authori[sz]ed|bad user name or password|Connection Refused/i)
    await mosquittoPub(node.deviceId, node.token, readingsTopic(other.deviceId), message(7, Date.now() - 5000, 'ph'))
    await sleep(700)
    expect(await rowsOf(other.tankId)).toHaveLength(0)
    await stop(app)
  })

  it('counts malformed payloads on the device and keeps consuming', async () => {
    const app = await start('ext-a')
    const before = await deviceStatus(other.deviceId)
    expect((await mosquittoPub(other.deviceId, other.token, readingsTopic(other.deviceId), 'not json {')).ok).toBe(true)
    expect((await mosquittoPub(other.deviceId, other.token, readingsTopic(other.deviceId), '{"v":2,"readings":[]}')).ok).toBe(true)
    const time = Date.now() - 30_000
    expect((await mosquittoPub(other.deviceId, other.token, readingsTopic(other.deviceId), message(7.1, time, 'ph'))).ok).toBe(true)
    expect(await until(async () => (await rowsOf(other.tankId)).length === 1)).toBe(true)
    await stop(app) // flushes the coalesced device status
    const after = await deviceStatus(other.deviceId)
    expect(Number(after.rejected_count) - Number(before.rejected_count)).toBe(2)
    // Four connections take messages side by side, so either refusal may be the last one recorded.
    expect(after.last_error).toMatch(/expected \{"v":1|payload is not valid JSON/)
  })

  it('splits the shared subscription between two instances: every message stored once', async () => {
    const a = await start('ext-a')
    const b = await start('ext-b')
    const stored = new Map<RunningServer, number>([
      [a, 0],
      [b, 0],
    ])
    // Counted where stored: each bus also hears the other instance's readings through the fan-out.
    for (const s of [a, b]) {
      s.ctx.events.on('readings.stored', (rows) => {
        if (!s.fanout.isRelaying()) stored.set(s, stored.get(s)! + rows.filter((r) => r.tankId === node.tankId).length)
      })
    }
    const device = await deviceClient(node)
    const t0 = Date.now() - 3600_000
    const N = 120
    for (let i = 0; i < N; i++) await device.publishAsync(readingsTopic(node.deviceId), message(24 + (i % 10) / 10, t0 + i * 1000), { qos: 1 })
    await device.endAsync()
    const inRange = async () => (await rowsOf(node.tankId)).filter((r) => r.time.getTime() >= t0 && r.time.getTime() < t0 + N * 1000)
    expect(await until(async () => (await inRange()).length === N)).toBe(true)
    await sleep(500)
    expect(await inRange()).toHaveLength(N)
    // mosquitto 2.0 gives each message of a $share group to one member (MQTT 5 clients here).
    expect(stored.get(a)! + stored.get(b)!).toBe(N)
    expect(stored.get(a)!).toBeGreaterThan(0)
    expect(stored.get(b)!).toBeGreaterThan(0)
    await stop(b)
    await stop(a)
  })

  it('stores a QoS 1 message once when the instance died after receiving it and before storing it', async () => {
    // Stand in for an instance that dies mid-message: its session takes messages and never acknowledges them.
    const app = await start('ext-crash')
    const { clientIds } = app.external!
    expect(clientIds).toEqual([0, 1, 2, 3].map((i) => `tankwarden-ext-crash-${i}`))
    await stop(app)
    const received: string[] = []
    const doomed = await Promise.all(
      clientIds.map(async (clientId) => {
        const c = await mqtt.connectAsync(broker.url(APP), {
          clientId,
          protocolVersion: 5,
          clean: false,
          properties: { sessionExpiryInterval: 3600 },
          reconnectPeriod: 0,
          customHandleAcks: (_topic, payload) => void received.push(payload.toString()), // never acknowledged
        })
        await c.subscribeAsync(SHARED_READINGS_FILTER, { qos: 1 })
        return c
      }),
    )
    const device = await deviceClient(node)
    const t0 = Date.now() - 7200_000
    for (let i = 0; i < 8; i++) await device.publishAsync(readingsTopic(node.deviceId), message(26 + i / 10, t0 + i * 1000), { qos: 1 })
    await device.endAsync()
    expect(await until(() => received.length >= 4)).toBe(true)
    for (const c of doomed) c.stream.destroy() // dies without DISCONNECT, nothing stored
    await sleep(300)
    const inRange = async () => (await rowsOf(node.tankId)).filter((r) => r.time.getTime() >= t0 && r.time.getTime() < t0 + 8000)
    expect(await inRange()).toHaveLength(0)

    const restarted = await start('ext-crash') // same INSTANCE_ID: the broker resends what was never acknowledged
    expect(await until(async () => (await inRange()).length === 8)).toBe(true)
    await sleep(500)
    expect((await inRange()).map((r) => r.value)).toEqual([26, 26.1, 26.2, 26.3, 26.4, 26.5, 26.6, 26.7])
    await stop(restarted)
  })
})
