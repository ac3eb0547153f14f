import mqtt, { type MqttClient } from 'mqtt'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { readingsTopic } from '@shared/ingest/contract'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice } from '../helpers/fixtures'
import { appProcess, type AppProcess } from './helpers/faults-app-process'
import { sleep, until } from '../helpers/wait'

// Fault: the app process is SIGKILLed while a rule "above 28 °C for 10 min" is holding, and
// started again. The incident must open at hold start + 10 min, exactly once, like an app that
// never stopped would have opened it.

const MIN = 60_000
/** How long after the readings go out the holds end: time to check nothing tripped and kill the app. */
const LEAD_MS = 20_000
let db: Awaited<ReturnType<typeof createTestDatabase>>
let ctx: AppContext
let app: AppProcess
type Node = Awaited<ReturnType<typeof createTankWithDevice>>
let resent: Node
let quiet: Node

async function tankWithHeatRule(org: Awaited<ReturnType<typeof createOrgIn>>, name: string) {
  const node = await createTankWithDevice(ctx, org, name)
  await ctx.models.WatchRule.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0],
    tankId: node.tankId,
    name: 'Temperature above 28 °C for 10 min',
    severity: 'alarm',
    spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
  })
  return node
}

beforeAll(async () => {
  db = await createTestDatabase()
  ctx = createContext(testConfig({ databaseUrl: db.url }))
  const org = await createOrgIn(ctx, 'Marrowfen Aquatics night')
  resent = await tankWithHeatRule(org, 'Sump-fed display')
  quiet = await tankWithHeatRule(org, 'Breeding rack 3')
  // A one-second engine tick, so holds that end between readings are noticed promptly.
  app = await appProcess(db.url, { RULES_TICK_SECONDS: '1' })
  await app.start()
}, 180_000)
afterAll(async () => {
  await app?.stop()
  app?.cleanup()
  await closeContext(ctx)
  await db.drop()
})

function device(node: Node): MqttClient {
  const client = mqtt.connect(app.mqttUrl, {
    username: String(node.deviceId),
    password: node.token,
    clientId: `kill-${node.deviceId}-${process.pid}`,
    reconnectPeriod: 250,
    connectTimeout: 3000,
  })
  client.on('error', () => {}) // refused while the app is down; the client keeps retrying
  return client
}
const publish = (client: MqttClient, node: Node, at: number, value: number) =>
  client.publishAsync(readingsTopic(node.deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value, time: new Date(at).toISOString() }] }), {
    qos: 1,
  })

const incidentsOf = (tankId: number) => ctx.models.Incident.findAll({ where: { tankId }, order: [['id', 'ASC']] })

describe('app killed mid-hold of a rule', () => {
  it(
    'opens the incident at hold start + hold, once, whether the hold ends on a reading delivered after the restart or with the device gone quiet',
    { timeout: 480_000 },
    async () => {
      const a = device(resent)
      const b = device(quiet)
      await until(() => a.connected && b.connected)
      // Both holds end LEAD_MS from now, with readings every minute (28.6 and 28.7 °C) from their
      // start up to a minute before their end: the app is killed while they hold, and stays down
      // until they have ended. A longer lead only waits longer on the real clock.
      const holdStart = Date.now() + LEAD_MS - 10 * MIN
      const holdEnd = holdStart + 10 * MIN
      const resentStart = holdStart
      const quietStart = holdStart
      for (let i = 0; i <= 9; i++) await publish(a, resent, resentStart + i * MIN, 28.6)
      for (let i = 0; i <= 9; i++) await publish(b, quiet, quietStart + i * MIN, 28.7)
      await sleep(1500) // a few engine ticks: both rules are holding, neither has tripped
      expect(await incidentsOf(resent.tankId)).toHaveLength(0)
      expect(await incidentsOf(quiet.tankId)).toHaveLength(0)

      await app.kill()
      // The premise, which a machine too slow for LEAD_MS breaks: the app went down while both rules held.
      expect(Date.now(), 'killed 5 s or more before the holds end').toBeLessThan(holdEnd - 5000)
      // "Resent" keeps measuring while the app is down (5 s before the hold ends, and as it ends); its
      // client keeps the readings until it can deliver them. "Quiet" has gone silent after its last reading.
      const later: Array<Promise<unknown>> = []
      for (const at of [holdEnd - 5000, holdEnd]) {
        await sleep(Math.max(0, at - Date.now()))
        later.push(publish(a, resent, at, 28.8))
      }
      // Down until 5 s after both holds ended.
      await sleep(Math.max(0, holdEnd + 5000 - Date.now()))
      await app.start()
      await Promise.all(later)

      expect(await until(async () => (await incidentsOf(resent.tankId)).length > 0 && (await incidentsOf(quiet.tankId)).length > 0, 20_000)).toBe(true)
      await sleep(2000) // ticks after the opening must not open a second one
      const [resentIncidents, quietIncidents] = [await incidentsOf(resent.tankId), await incidentsOf(quiet.tankId)]
      expect(resentIncidents).toHaveLength(1)
      expect(resentIncidents[0].conditionSince.getTime()).toBe(resentStart)
      expect(resentIncidents[0].openedAt.getTime()).toBe(resentStart + 10 * MIN)
      expect(quietIncidents).toHaveLength(1)
      expect(quietIncidents[0].conditionSince.getTime()).toBe(quietStart)
      expect(quietIncidents[0].openedAt.getTime()).toBe(quietStart + 10 * MIN)

      // Killed again after the opening, and restarted: the open incidents are taken up, not opened again.
      await app.kill()
      await app.start()
      await publish(a, resent, Date.now(), 28.9)
      await sleep(2500)
      const after = [...(await incidentsOf(resent.tankId)), ...(await incidentsOf(quiet.tankId))]
      expect(after.map((i) => [i.id, i.state])).toEqual([
        [resentIncidents[0].id, 'open'],
        [quietIncidents[0].id, 'open'],
      ])
      await a.endAsync(true)
      await b.endAsync(true)
    },
  )
})
