import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testConfig } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createOrgIn, createTankWithDevice } from '../helpers/fixtures'
import { startStoppablePostgres, type StoppablePostgres } from './helpers/faults-postgres'
import { httpPoster, mqttPublisher, storedTimes } from './helpers/faults-load'
import { sleep, until } from '../helpers/wait'

// Fault: the PostgreSQL server the app uses is stopped (fast shutdown, sessions terminated) and
// started again while devices keep sending over MQTT (QoS 1) and HTTP. The app is not restarted.

let pg: StoppablePostgres
let app: RunningServer
let mqttDevice: Awaited<ReturnType<typeof createTankWithDevice>>
let httpDevice: Awaited<ReturnType<typeof createTankWithDevice>>
let httpOnlyDevice: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  pg = await startStoppablePostgres()
  const databaseUrl = await pg.createMigratedDatabase('tw_fault_pg_restart')
  app = await startServer(testConfig({ databaseUrl, mqtt: { host: '127.0.0.1', port: 0 }, mail: { fakeSmtpPort: 0, from: 'faults@tankwarden.invalid' } }))
  const org = await createOrgIn(app.ctx, 'Marrowfen Aquatics outage')
  mqttDevice = await createTankWithDevice(app.ctx, org, 'Display reef')
  httpDevice = await createTankWithDevice(app.ctx, org, 'Quarantine 1')
  httpOnlyDevice = await createTankWithDevice(app.ctx, org, 'Quarantine 2')
})
afterAll(async () => {
  if (pg && !pg.isRunning()) await pg.start()
  await app?.stop()
  pg?.destroy()
})

const baseUrl = () => `http://127.0.0.1:${app.port}`
const health = async () => {
  try {
    const res = await fetch(`${baseUrl()}/api/v1/health`, { signal: AbortSignal.timeout(5000) })
    return { status: res.status, body: (await res.json()) as { ok?: boolean } }
  } catch {
    return { status: 0, body: {} }
  }
}

describe('PostgreSQL restarted mid-ingest', () => {
  it('keeps every acknowledged reading exactly once, answers HTTP 503 with Retry-After while down, and recovers by itself', async () => {
    const firstAt = Date.now() - 3600_000
    const mqttLoad = mqttPublisher(`mqtt://127.0.0.1:${app.mqttPort}`, mqttDevice, { metric: 'temperature', firstAt, everyMs: 20 })
    const httpLoad = httpPoster(baseUrl(), httpDevice, { metric: 'ph', firstAt, everyMs: 20 })
    await until(() => mqttLoad.acked.size > 20 && httpLoad.accepted.size > 20)

    await pg.stop()
    const downAt = Date.now()
    await sleep(3000)
    expect((await health()).status).toBe(503)
    await pg.start()
    const upAt = Date.now()

    // Both sources store new readings again, without anything restarting the app.
    const ackedBefore = mqttLoad.acked.size
    const acceptedBefore = httpLoad.accepted.size
    expect(await until(() => mqttLoad.acked.size > ackedBefore + 50 && httpLoad.accepted.size > acceptedBefore + 50, 30_000)).toBe(true)
    const { unacked } = await mqttLoad.stop()
    await httpLoad.stop()
    await mqttLoad.close()
    expect(unacked).toBe(0)

    const health200 = await health()
    expect(health200).toEqual({ status: 200, body: expect.objectContaining({ ok: true }) })

    // MQTT: every acknowledged reading is stored, each exactly once.
    const mqttStored = await storedTimes(app.ctx.sequelize, mqttDevice.deviceId, 'temperature')
    const lostMqtt = [...mqttLoad.acked].filter((at) => !mqttStored.has(at))
    expect(lostMqtt).toEqual([])
    expect([...mqttStored.values()].every((n) => n === 1)).toBe(true)
    expect([...mqttStored.keys()].every((at) => mqttLoad.published.has(at))).toBe(true)

    // HTTP: every reading answered "accepted" is stored once; while down the answer was 503 + Retry-After.
    const httpStored = await storedTimes(app.ctx.sequelize, httpDevice.deviceId, 'ph')
    expect([...httpLoad.accepted].filter((at) => !httpStored.has(at))).toEqual([])
    expect([...httpStored.values()].every((n) => n === 1)).toBe(true)
    const statuses = new Set(httpLoad.outcomes.map((o) => o.status))
    expect([...statuses].sort()).toEqual([200, 503])
    const refusals = httpLoad.outcomes.filter((o) => o.status === 503)
    expect(refusals.length).toBeGreaterThan(0)
    expect(refusals.every((o) => Number(o.retryAfter) > 0)).toBe(true)
    expect(refusals.every((o) => o.at >= downAt - 1000)).toBe(true)
    // Accepted readings after the restart prove the HTTP path came back on its own.
    expect(httpLoad.outcomes.some((o) => o.status === 200 && o.at > upAt)).toBe(true)

    // The watch-rule engine's lock connection came back too.
    expect(await until(() => app.rules.lock.isLeader, 15_000)).toBe(true)
    console.log(
      `[faults] PostgreSQL restart: MQTT ${mqttLoad.published.size} published, ${mqttLoad.acked.size} acknowledged, ${mqttStored.size} stored, ` +
        `${mqttLoad.reconnects} reconnects; HTTP ${httpLoad.outcomes.length} posts, ${httpLoad.accepted.size} accepted, ${refusals.length} answered 503`,
    )
  })

  it('recovers when only HTTP devices are sending (no held MQTT write to notice the database is back)', async () => {
    const firstAt = Date.now() - 2 * 3600_000
    const httpLoad = httpPoster(baseUrl(), httpOnlyDevice, { metric: 'ph', firstAt, everyMs: 50 })
    await until(() => httpLoad.accepted.size > 10)
    await pg.stop()
    await sleep(2000)
    await pg.start()
    const upAt = Date.now()
    const recovered = await until(() => httpLoad.outcomes.some((o) => o.status === 200 && o.at > upAt + 200), 20_000)
    await httpLoad.stop()
    expect(recovered).toBe(true)
    const statuses = new Set(httpLoad.outcomes.map((o) => o.status))
    expect([...statuses].sort()).toEqual([200, 503])
    const stored = await storedTimes(app.ctx.sequelize, httpOnlyDevice.deviceId, 'ph')
    expect([...httpLoad.accepted].filter((at) => !stored.has(at))).toEqual([])
  })
})
