import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testConfig } from '../../server/config'
import { startServer, type RunningServer } from '../../server/server'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { openLiveClient } from '../helpers/live-client'
import { sleep, until } from '../helpers/wait'

const MIN = 60_000
let db: Awaited<ReturnType<typeof createTestDatabase>>
let a: RunningServer
let b: RunningServer
let org: TestOrg

const start = (instanceId: string) =>
  startServer(
    testConfig({ databaseUrl: db.url, instanceId, mqtt: { host: '127.0.0.1', port: 0 }, mail: { fakeSmtpPort: 0, from: 'fanout@tankwarden.invalid' } }),
  )
const base = (s: RunningServer) => `http://127.0.0.1:${s.port}`

const post = (s: RunningServer, path: string, token: string, body: unknown) =>
  fetch(`${base(s)}/api/v1${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
    body: JSON.stringify(body),
  })

const batch = (t0: number, count: number, value: (i: number) => number) => ({
  v: 1,
  readings: Array.from({ length: count }, (_, i) => ({ metric: 'temperature', value: value(i), time: new Date(t0 + i * 1000).toISOString() })),
})

beforeAll(async () => {
  db = await createTestDatabase()
  a = await start('fanout-a')
  b = await start('fanout-b')
  org = await createOrgIn(b.ctx, 'Fan-out Org')
})
afterAll(async () => {
  await b?.stop()
  await a?.stop()
  await db?.drop()
})

describe('live fan-out across instances over LISTEN/NOTIFY', () => {
  it('pushes readings stored by one instance to ws clients on both, each reading once', async () => {
    const node = await createTankWithDevice(b.ctx, org, 'Fan-out tank')
    const onA = await openLiveClient(base(a))
    const onB = await openLiveClient(base(b))
    await onA.subscribe(org.users.viewer.token, [node.tankId])
    await onB.subscribe(org.users.viewer.token, [node.tankId])
    const t0 = Date.now() - 2 * 3600_000
    // Three full messages: 3,000 rows, far more than one 8,000-byte NOTIFY payload holds.
    for (let k = 0; k < 3; k++) {
      const res = await post(
        a,
        '/readings',
        node.token,
        batch(t0 + k * 1000_000, 1000, (i) => 24 + (i % 50) / 100),
      )
      expect(((await res.json()) as { accepted: number }).accepted).toBe(1000)
    }
    const keys = (c: typeof onA) =>
      c
        .liveReadings()
        .filter((r) => r.tankId === node.tankId)
        .map((r) => `${r.metric}@${r.time}`)
    expect(await until(() => keys(onB).length >= 3000)).toBe(true)
    expect(await until(() => keys(onA).length >= 3000)).toBe(true)
    await sleep(500)
    for (const c of [onA, onB]) {
      expect(keys(c)).toHaveLength(3000)
      expect(new Set(keys(c)).size).toBe(3000)
    }
    const first = onB.liveReadings().find((r) => r.time === new Date(t0).toISOString())
    expect(first).toEqual({ tankId: node.tankId, metric: 'temperature', time: new Date(t0).toISOString(), value: 24, source: 'device' })

    // A client that reconnects to the other instance catches up from the table.
    const late = await openLiveClient(base(b))
    await late.subscribe(org.users.viewer.token, [node.tankId], new Date(t0 + 2 * 1000_000 + 989_000).toISOString())
    const catchUp = await late.next((m) => m.type === 'readings' && m.catchUp === true)
    expect(catchUp.type === 'readings' && catchUp.readings.map((r) => r.time)).toEqual(
      Array.from({ length: 10 }, (_, i) => new Date(t0 + 2 * 1000_000 + 990_000 + i * 1000).toISOString()),
    )
    await Promise.all([onA.close(), onB.close(), late.close()])
  })

  it("lets the leader's engine see readings and rule changes from the other instance, and spreads incident changes", async () => {
    expect(await until(() => a.rules.lock.isLeader || b.rules.lock.isLeader)).toBe(true)
    const [leader, follower] = a.rules.lock.isLeader ? [a, b] : [b, a]
    const node = await createTankWithDevice(b.ctx, org, 'Fan-out rule tank')
    const watcher = await openLiveClient(base(follower))
    await watcher.subscribe(org.users.keeper.token, [node.tankId])

    // The rule is made on the follower; the leader hears of it through the fan-out.
    const rule = await post(follower, `/tanks/${node.tankId}/rules`, org.users.owner.token, {
      name: 'Above 28 °C for 10 min',
      severity: 'alarm',
      spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
    })
    expect(rule.status).toBe(201)
    await sleep(1000)
    const t0 = Date.now() - 30 * MIN
    const res = await post(follower, '/readings', node.token, {
      v: 1,
      readings: Array.from({ length: 12 }, (_, i) => ({ metric: 'temperature', value: 29, time: new Date(t0 + i * MIN).toISOString() })),
    })
    expect(((await res.json()) as { accepted: number }).accepted).toBe(12)

    const opened = await watcher.next((m) => m.type === 'incident' && m.tankId === node.tankId, 10_000)
    expect(opened).toMatchObject({ type: 'incident', tankId: node.tankId, state: 'open' })
    expect(leader.rules.lock.isLeader).toBe(true)
    const incidentId = opened.type === 'incident' ? opened.incidentId : 0
    const [row] = (await follower.ctx.sequelize.query(`SELECT opened_at FROM incidents WHERE tank_id = ${node.tankId}`))[0] as Array<{ opened_at: Date }>
    expect(row.opened_at.getTime()).toBe(t0 + 10 * MIN)

    // Acknowledged through the leader; the client on the follower hears it.
    const ack = await post(leader, `/incidents/${incidentId}/acknowledge`, org.users.keeper.token, { note: 'Heater checked' })
    expect(ack.status).toBe(200)
    expect(await watcher.next((m) => m.type === 'incident' && m.incidentId === incidentId && m.state === 'acknowledged')).toMatchObject({
      state: 'acknowledged',
    })
    await watcher.close()
  })
})
