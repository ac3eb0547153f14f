import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { appProcess } from './helpers/faults-app-process'
import { mqttPublisher, storedTimes } from './helpers/faults-load'
import { sleep, until } from '../helpers/wait'

// Fault: a device's TCP connection drops mid-stream (either end), and the whole app process with
// its embedded broker goes away and comes back; devices reconnect and send unacknowledged QoS 1
// messages again. Every acknowledged reading must be stored, and each reading only once.

type Publisher = ReturnType<typeof mqttPublisher>

async function expectStoredOnce(ctx: AppContext, deviceId: number, load: Publisher) {
  const stored = await storedTimes(ctx.sequelize, deviceId, 'temperature')
  expect([...load.acked].filter((at) => !stored.has(at))).toEqual([])
  expect([...stored.values()].every((n) => n === 1)).toBe(true)
  expect([...stored.keys()].every((at) => load.published.has(at))).toBe(true)
  return stored
}

describe('device connection dropped mid-batch (embedded broker)', () => {
  let s: Awaited<ReturnType<typeof startTestServer>>
  beforeAll(async () => {
    s = await startTestServer()
  })
  afterAll(() => s.close())

  it('resends what was not acknowledged after each drop, and dedupe keeps one row per reading', async () => {
    const org = await s.createOrg('Marrowfen Aquatics flaky wifi')
    const node = await createTankWithDevice(s.ctx, org, 'Shrimp rack')
    const load = mqttPublisher(s.mqttUrl, node, { metric: 'temperature', firstAt: Date.now() - 3600_000, everyMs: 20 })
    // The broker keeps a device's client id in the device's own namespace.
    const clientId = `${node.deviceId}/fault-device-${node.deviceId}-${process.pid}`
    let drops = 0
    for (let round = 0; round < 6; round++) {
      const before = load.acked.size
      expect(await until(() => load.client.connected && load.acked.size > before + 40, 15_000)).toBe(true)
      if (round % 2 === 0) {
        // The device's end: its socket is destroyed with messages in flight.
        load.client.stream.destroy()
      } else {
        // The broker's end: the server drops the connection.
        // aedes keeps its clients by id; the map is not in its type declarations.
        const clients = (s.broker!.broker as unknown as { clients: Record<string, { conn: { destroy: () => void } }> }).clients
        const conn = clients[clientId]?.conn
        expect(conn).toBeDefined()
        conn!.destroy()
      }
      drops++
    }
    const before = load.acked.size
    expect(await until(() => load.acked.size > before + 40, 15_000)).toBe(true)
    const { unacked } = await load.stop(30_000)
    await load.close()
    expect(unacked).toBe(0)

    const stored = await expectStoredOnce(s.ctx, node.deviceId, load)
    expect(load.reconnects).toBeGreaterThanOrEqual(drops)
    // Messages the broker took in: more than were stored means some arrived twice and were deduplicated.
    const received = s.broker!.stats().messages
    console.log(
      `[faults] connection drops: ${drops} drops, ${load.reconnects} reconnects, ${load.published.size} published, ${load.acked.size} acknowledged, ${received} messages received, ${stored.size} stored, ${load.failures.length} given up by the client (${[...new Set(load.failures)].join('; ')})`,
    )
    expect(received).toBeGreaterThan(stored.size)
  })
})

describe('app process with its embedded broker killed and restarted', () => {
  let db: Awaited<ReturnType<typeof createTestDatabase>>
  let ctx: AppContext
  let app: Awaited<ReturnType<typeof appProcess>>
  beforeAll(async () => {
    db = await createTestDatabase()
    ctx = createContext(testConfig({ databaseUrl: db.url }))
    app = await appProcess(db.url)
    await app.start()
  }, 180_000)
  afterAll(async () => {
    await app?.stop()
    app?.cleanup()
    await closeContext(ctx)
    await db.drop()
  })

  it('loses no acknowledged reading and stores none twice across a SIGKILL and an orderly restart', { timeout: 480_000 }, async () => {
    const org = await createOrgIn(ctx, 'Marrowfen Aquatics power cut')
    const nodes = [await createTankWithDevice(ctx, org, 'Pond 1'), await createTankWithDevice(ctx, org, 'Pond 2')]
    const loads = nodes.map((node, k) => mqttPublisher(app.mqttUrl, node, { metric: 'temperature', firstAt: Date.now() - (3 + k) * 3600_000, everyMs: 100 }))
    const progress = async () => {
      const before = loads.map((l) => l.acked.size)
      return until(() => loads.every((l, k) => l.client.connected && l.acked.size > before[k] + 30), 60_000)
    }
    expect(await progress()).toBe(true)
    await app.kill() // SIGKILL: readings in the write buffer and PUBACKs not yet sent are gone with it
    await sleep(500)
    await app.start()
    expect(await progress()).toBe(true)
    await app.stop() // SIGTERM: the app drains what it holds and closes the broker
    await app.start()
    expect(await progress()).toBe(true)
    for (const load of loads) {
      expect((await load.stop(30_000)).unacked).toBe(0)
      await load.close()
    }
    for (const [k, node] of nodes.entries()) {
      const stored = await expectStoredOnce(ctx, node.deviceId, loads[k])
      expect(loads[k].reconnects).toBeGreaterThanOrEqual(2)
      console.log(
        `[faults] app restarts, device ${k + 1}: ${loads[k].published.size} published, ${loads[k].acked.size} acknowledged, ${stored.size} stored, ${loads[k].reconnects} reconnects, ${loads[k].failures.length} given up by the client (${[...new Set(loads[k].failures)].join('; ')})`,
      )
    }
    expect(app.starts).toBe(3)
  })
})
