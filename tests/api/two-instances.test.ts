import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testConfig } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice } from '../helpers/fixtures'
import { sleep, until } from '../helpers/wait'

const MIN = 60_000
let db: Awaited<ReturnType<typeof createTestDatabase>>
let a: RunningServer
let b: RunningServer

const start = () =>
  startServer(testConfig({ databaseUrl: db.url, mqtt: { host: '127.0.0.1', port: 0 }, mail: { fakeSmtpPort: 0, from: 'two@tankwarden.invalid' } }))

beforeAll(async () => {
  db = await createTestDatabase()
  a = await start()
  b = await start()
})
afterAll(async () => {
  await b?.stop()
  await a?.stop()
  await db.drop()
})

describe('two app instances on one database', () => {
  it('run the rule engine in exactly one of them; the other takes over when it stops, opening the missed incident once', async () => {
    expect(await until(() => a.rules.lock.isLeader || b.rules.lock.isLeader)).toBe(true)
    await sleep(500)
    expect([a.rules.lock.isLeader, b.rules.lock.isLeader].filter(Boolean)).toHaveLength(1)
    const [leader, follower] = a.rules.lock.isLeader ? [a, b] : [b, a]

    const org = await createOrgIn(follower.ctx, 'Two Instance Org')
    const node = await createTankWithDevice(follower.ctx, org, 'Shared tank')
    await follower.ctx.models.WatchRule.create({
      organizationId: org.organizationId,
      siteId: org.siteIds[0],
      tankId: node.tankId,
      name: 'Temperature above 28 °C for 10 min',
      severity: 'alarm',
      spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
    })
    // The readings arrive at the follower while the leader goes away.
    const t0 = Date.now() - 30 * MIN
    const res = await fetch(`http://127.0.0.1:${follower.port}/api/v1/readings`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${node.token}` },
      body: JSON.stringify({
        v: 1,
        readings: Array.from({ length: 12 }, (_, i) => ({ metric: 'temperature', value: 29, time: new Date(t0 + i * MIN).toISOString() })),
      }),
    })
    expect(((await res.json()) as { accepted: number }).accepted).toBe(12)
    await leader.stop()

    expect(await until(() => follower.rules.lock.isLeader)).toBe(true)
    await follower.rules.engine.settle()
    const incidents = await follower.ctx.models.Incident.findAll({ where: { tankId: node.tankId } })
    expect(incidents).toHaveLength(1)
    expect(incidents[0].openedAt.getTime()).toBe(t0 + 10 * MIN)
  }, 40_000)
})
