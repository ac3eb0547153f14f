import pg from 'pg'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { testConfig } from '../../server/config'
import { FANOUT_CHANNEL } from '../../server/platform/cluster/fanout'
import { startServer, type RunningServer } from '../../server/server'
import { createTestDatabase } from '../helpers/db'
import { createOrgIn, createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { openLiveClient } from '../helpers/live-client'

let db: Awaited<ReturnType<typeof createTestDatabase>>
let lone: RunningServer
let org: TestOrg
let listener: pg.Client
const heard: string[] = []

beforeAll(async () => {
  db = await createTestDatabase()
  lone = await startServer(
    testConfig({ databaseUrl: db.url, clusterFanout: false, mqtt: { host: '127.0.0.1', port: 0 }, mail: { fakeSmtpPort: 0, from: 'lone@tankwarden.invalid' } }),
  )
  org = await createOrgIn(lone.ctx, 'Lone Org')
  // Stands in for another instance: whatever this one sends on the channel arrives here.
  listener = new pg.Client({ connectionString: db.url })
  await listener.connect()
  listener.on('notification', (m) => heard.push(m.payload ?? ''))
  await listener.query(`LISTEN ${FANOUT_CHANNEL}`)
})
afterAll(async () => {
  await listener?.end()
  await lone?.stop()
  await db?.drop()
})

describe('CLUSTER_FANOUT=false, one instance alone on its database', () => {
  it('stores readings and pushes them to its own ws clients, and sends nothing to other instances', async () => {
    const node = await createTankWithDevice(lone.ctx, org, 'Lone tank')
    const live = await openLiveClient(`http://127.0.0.1:${lone.port}`)
    await live.subscribe(org.users.viewer.token, [node.tankId])
    const t0 = Date.now() - 3600_000
    const res = await fetch(`http://127.0.0.1:${lone.port}/api/v1/readings`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${node.token}` },
      body: JSON.stringify({
        v: 1,
        readings: Array.from({ length: 50 }, (_, i) => ({ metric: 'temperature', value: 25, time: new Date(t0 + i * 1000).toISOString() })),
      }),
    })
    expect(res.status).toBe(200)
    expect(((await res.json()) as { accepted: number }).accepted).toBe(50)
    const pushed = await live.next((m) => m.type === 'readings')
    expect(pushed.type === 'readings' && pushed.readings[0]).toMatchObject({ tankId: node.tankId, metric: 'temperature', value: 25 })
    const [row] = await lone.ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
      bind: [node.tankId],
      type: QueryTypes.SELECT,
    })
    expect(row!.n).toBe(50)
    await new Promise((r) => setTimeout(r, 500))
    expect(heard).toEqual([])
    expect(lone.fanout.received()).toBe(0)
    await live.close()
  })
})
