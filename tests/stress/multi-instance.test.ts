import { fork, type ChildProcess } from 'node:child_process'
import { compiledEntry } from '../helpers/compiled-server'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { readingsTopic } from '@shared/ingest/contract'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { openLiveClient, type LiveClient } from '../helpers/live-client'
import { DEPLOYMENT_ACL, startMosquitto, type MosquittoUser, type RunningMosquitto } from '../helpers/mosquitto'
import { freePort } from '../helpers/ports'
import { sleep, until } from '../helpers/wait'

const ENTRY = join(import.meta.dirname, 'multi-instance-entry.ts')
const APP: MosquittoUser = { username: 'tankwarden-app', password: 'multi-instance-app-secret' }
const N = 600
const STEP_MS = 1000
const TRIP_AT = 300 // readings from this index on are above the limit

type Instance = {
  id: string
  port: number
  child: ChildProcess
  stored: Set<number>
  leading: boolean
  output: string[]
}

let db: Awaited<ReturnType<typeof createTestDatabase>>
let ctx: AppContext
let broker: RunningMosquitto
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let dataDir: string
const instances: Instance[] = []
let T = Date.now()
const mark = (what: string) => console.log(`[multi] ${((Date.now() - T) / 1000).toFixed(1)} s ${what}`)

/** One app instance as a separate process (separate model classes, pools and sockets), on its own ports. */
async function startInstance(id: string, port?: number): Promise<Instance> {
  const httpPort = port ?? (await freePort())
  const env = {
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: db.url,
    INSTANCE_ID: id,
    PORT: String(httpPort),
    MQTT_URL: broker.url(APP),
    FAKE_SMTP_PORT: String(await freePort()),
    JWT_SECRET: ctx.config.jwtSecret,
    DATA_DIR: dataDir,
    SERVE_CLIENT: 'false',
    LOG_LEVEL: 'warn',
    RULES_TICK_SECONDS: '1',
    BCRYPT_ROUNDS: '4',
  }
  const child = fork(await compiledEntry(ENTRY), [], { execArgv: [], env, stdio: ['ignore', 'pipe', 'pipe', 'ipc'] })
  const instance: Instance = { id, port: httpPort, child, stored: new Set(), leading: false, output: [] }
  child.stdout?.on('data', (d) => instance.output.push(String(d)))
  child.stderr?.on('data', (d) => instance.output.push(String(d)))
  await new Promise<void>((resolve, reject) => {
    child.on('message', (m: { type: string; times?: number[]; leading?: boolean }) => {
      if (m.type === 'ready') resolve()
      if (m.type === 'stored') for (const t of m.times!) instance.stored.add(t)
      if (m.type === 'leader') instance.leading = m.leading!
    })
    child.once('exit', (code) => reject(new Error(`${id} exited with ${code}: ${instance.output.join('')}`)))
  })
  instances.push(instance)
  return instance
}

async function stopInstance(instance: Instance, signal: NodeJS.Signals) {
  if (instance.child.exitCode === null && instance.child.signalCode === null) {
    const exited = new Promise((r) => instance.child.once('exit', r))
    instance.child.kill(signal)
    await exited
  }
  instances.splice(instances.indexOf(instance), 1)
}

const count = async (sql: string, bind: unknown[]) => Number((await ctx.sequelize.query<{ n: string }>(sql, { bind, type: QueryTypes.SELECT }))[0].n)

beforeAll(async () => {
  db = await createTestDatabase()
  dataDir = mkdtempSync(join(tmpdir(), 'tw-multi-'))
  ctx = createContext(testConfig({ databaseUrl: db.url }))
  org = await createOrgIn(ctx, 'Marrowfen Aquatics multi')
  node = await createTankWithDevice(ctx, org, 'Show tank 4')
  await ctx.models.WatchRule.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0],
    tankId: node.tankId,
    name: 'Temperature above 28 °C for 1 min',
    severity: 'alarm',
    spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 1, clearMargin: 0.5 },
  })
  // The keeper is on duty for the whole run, so the opened incident mails exactly one person.
  await ctx.models.DutyOverride.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0],
    userId: org.users.keeper.id,
    kind: 'add',
    startsAt: new Date(Date.now() - 86400_000),
    endsAt: new Date(Date.now() + 86400_000),
    createdBy: null,
  })
  broker = await startMosquitto({ users: [APP, { username: String(node.deviceId), password: node.token }], acl: DEPLOYMENT_ACL(APP.username) })
}, 120_000)

afterAll(async () => {
  for (const instance of [...instances]) await stopInstance(instance, 'SIGTERM')
  await broker?.stop()
  await closeContext(ctx)
  await db?.drop()
  rmSync(dataDir, { recursive: true, force: true })
})

describe('three instances on one PostgreSQL and one mosquitto, one killed mid-stream', () => {
  it('stores every reading once, opens the incident once, mails once, and pushes readings stored elsewhere to a ws client', async () => {
    T = Date.now()
    const started = await Promise.all(['multi-1', 'multi-2', 'multi-3'].map((id) => startInstance(id)))
    expect(await until(() => started.filter((i) => i.leading).length === 1)).toBe(true)
    mark('started')
    const victim = started.find((i) => i.leading)!
    const survivors = started.filter((i) => i !== victim)
    const watched = survivors[0]

    let client: LiveClient = await openLiveClient(`http://127.0.0.1:${watched.port}`)
    await client.subscribe(org.users.viewer.token, [node.tankId])

    const device = await mqtt.connectAsync(broker.url({ username: String(node.deviceId), password: node.token }), {
      clientId: `device-${node.deviceId}`,
      reconnectPeriod: 0,
    })
    const t0 = Date.now() - 20 * 60_000
    const value = (i: number) => (i >= TRIP_AT ? 29 : 25 + (i % 10) / 10)
    let killedAt = -1
    for (let i = 0; i < N; i++) {
      const payload = JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value: value(i), time: new Date(t0 + i * STEP_MS).toISOString() }] })
      await device.publishAsync(readingsTopic(node.deviceId), payload, { qos: 1 })
      if (i === 200) {
        // SIGKILL the engine leader while messages are in flight to it: no goodbye, no flush, unacknowledged messages stay on the broker.
        victim.child.kill('SIGKILL')
        killedAt = i
      }
      if (i % 20 === 0) await sleep(10)
    }
    await device.endAsync()
    mark('published')
    expect(killedAt).toBe(200)
    await new Promise((r) => (victim.child.exitCode !== null || victim.child.signalCode !== null ? r(null) : victim.child.once('exit', r)))
    instances.splice(instances.indexOf(victim), 1)

    // One of the survivors takes over the engine; the messages routed to the dead instance wait in its session.
    expect(await until(() => survivors.some((i) => i.leading))).toBe(true)
    mark('failover')
    const stored = () => count(`SELECT count(*) AS n FROM readings WHERE tank_id = $1`, [node.tankId])
    expect(await until(async () => (await stored()) >= N - 1, 5000)).toBe(false)

    // The supervisor restarts it under the same INSTANCE_ID: the broker hands its session back.
    const restarted = await startInstance(victim.id)
    mark('restarted')
    expect(await until(async () => (await stored()) === N, 30_000)).toBe(true)
    mark('all stored')
    await sleep(1500)

    // Every reading stored exactly once, with its own value.
    const rows = await ctx.sequelize.query<{ time: Date; value: number }>(`SELECT time, value FROM readings WHERE tank_id = $1 ORDER BY time`, {
      bind: [node.tankId],
      type: QueryTypes.SELECT,
    })
    expect(rows).toHaveLength(N)
    expect(rows.map((r) => [r.time.getTime(), r.value])).toEqual(Array.from({ length: N }, (_, i) => [t0 + i * STEP_MS, value(i)]))
    // Spread over the instances: each survivor and the restarted one stored a share.
    for (const i of [...survivors, restarted]) expect(i.stored.size).toBeGreaterThan(0)
    expect(restarted.stored.size).toBeGreaterThan(0)

    // The incident opened once, at the first minute above the limit the engine saw.
    expect(await until(async () => (await count(`SELECT count(*) AS n FROM incidents WHERE tank_id = $1`, [node.tankId])) >= 1)).toBe(true)
    const incidents = await ctx.sequelize.query<{ id: number; opened_at: Date }>(`SELECT id, opened_at FROM incidents WHERE tank_id = $1`, {
      bind: [node.tankId],
      type: QueryTypes.SELECT,
    })
    expect(incidents).toHaveLength(1)
    mark('incident')
    const openedAfterTrip = incidents[0].opened_at.getTime() - (t0 + TRIP_AT * STEP_MS)
    expect(openedAfterTrip).toBeGreaterThanOrEqual(60_000)
    expect(openedAfterTrip).toBeLessThan(60_000 + 15 * STEP_MS)

    // Each mail once: every sent outbox row arrived at the fake SMTP exactly once.
    expect(
      await until(async () => (await count(`SELECT count(*) AS n FROM mail_outbox WHERE incident_id = $1 AND status = 'sent'`, [incidents[0].id])) >= 1),
    ).toBe(true)
    await sleep(2000)
    const outbox = await ctx.sequelize.query<{ smtp_message_id: string; to_address: string; kind: string }>(
      `SELECT smtp_message_id, to_address, kind FROM mail_outbox WHERE incident_id = $1`,
      { bind: [incidents[0].id], type: QueryTypes.SELECT },
    )
    expect(outbox).toEqual([{ smtp_message_id: expect.any(String), to_address: org.users.keeper.email, kind: 'incident_opened' }])
    const received = await ctx.sequelize.query<{ message_id: string }>(`SELECT headers->>'message-id' AS message_id FROM fake_mailbox`, {
      type: QueryTypes.SELECT,
    })
    expect(received.map((r) => r.message_id)).toEqual([outbox[0].smtp_message_id])

    // The ws client on a survivor saw, live and once each, the readings the other instances stored.
    const seen = client
      .liveReadings()
      .filter((r) => r.tankId === node.tankId)
      .map((r) => new Date(r.time).getTime())
    expect(new Set(seen).size).toBe(seen.length)
    const storedElsewhere = [...survivors.filter((i) => i !== watched), restarted].flatMap((i) => [...i.stored])
    expect(storedElsewhere.length).toBeGreaterThan(50)
    const seenSet = new Set(seen)
    expect(storedElsewhere.filter((t) => !seenSet.has(t))).toEqual([])
    for (const t of watched.stored) expect(seenSet.has(t)).toBe(true)
    const shares = [...survivors, restarted].map((i) => `${i.id}${i === restarted ? ' (restarted)' : ''} ${i.stored.size}`).join(', ')
    mark(
      `stored by instance: ${shares}; ${N - [...survivors, restarted].reduce((n, i) => n + i.stored.size, 0)} before the kill by ${victim.id}; ws client on ${watched.id} saw ${seen.length}`,
    )
    await client.close()

    mark('ws checked')
    // A client reconnecting to another instance catches up on everything from the table.
    client = await openLiveClient(`http://127.0.0.1:${restarted.port}`)
    await client.subscribe(org.users.viewer.token, [node.tankId], new Date(t0 - 1).toISOString())
    const catchUp = await client.next((m) => m.type === 'readings' && m.catchUp === true)
    expect(catchUp.type === 'readings' && catchUp.readings.length).toBe(N)
    await client.close()
  }, 480_000) // process start-up alone takes 20 s and more on a busy 2-core machine
})
