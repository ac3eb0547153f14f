import pg from 'pg'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { BatchWriter, BufferFullError, DatabaseUnavailableError, type ReadingRow } from '../../server/readings/batch-writer'
import { createLogger } from '../../server/platform/logger'
import { bearer, startTestApp } from '../helpers/app'
import { adminUrl } from '../helpers/db-urls'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { until } from '../helpers/wait'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let dbName: string

/** A real outage: the database refuses new connections and its open ones are terminated. */
async function setDatabaseAvailable(available: boolean) {
  const admin = new pg.Client({ connectionString: adminUrl() })
  await admin.connect()
  await admin.query(`ALTER DATABASE ${dbName} WITH ALLOW_CONNECTIONS ${available}`)
  if (!available) await admin.query('SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = $1', [dbName])
  await admin.end()
}

beforeAll(async () => {
  t = await startTestApp()
  dbName = new URL(t.ctx.config.databaseUrl).pathname.slice(1)
  org = await t.createOrg('Outage Org')
  node = await createTankWithDevice(t.ctx, org, 'Outage tank')
})
afterAll(async () => {
  await setDatabaseAvailable(true)
  await t.close()
})

const row = (i: number): ReadingRow => ({
  sourceKey: `d:${node.deviceId}`,
  metric: 'temperature',
  time: new Date(Date.now() - 600_000 + i * 1000),
  tankId: node.tankId,
  value: 25 + i / 100,
  source: 'device',
})

describe('when PostgreSQL is unavailable', () => {
  it('HTTP answers 503 with Retry-After, held (MQTT) readings wait and are written when it returns', async () => {
    const writer = new BatchWriter(t.ctx.sequelize, createLogger('silent'), { flushMs: 20 })
    await setDatabaseAvailable(false)
    const held = writer.write([row(1), row(2), row(3)], { hold: true })
    // Wait until the first flush has failed.
    await until(() => !writer.healthy, 2000, 20)
    expect(writer.healthy).toBe(false)
    await expect(writer.write([row(4)], { hold: false })).rejects.toBeInstanceOf(DatabaseUnavailableError)

    const res = await t
      .api()
      .post('/api/v1/readings')
      .set(bearer(node.token))
      .send({ v: 1, readings: [{ metric: 'ph', value: 7, time: new Date().toISOString() }] })
    expect(res.status).toBe(503)
    expect(res.body.error.code).toBe('unavailable')
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0)

    await setDatabaseAvailable(true)
    expect(await held).toEqual([true, true, true])
    const rows = await t.ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
      bind: [node.tankId],
      type: QueryTypes.SELECT,
    })
    expect(rows[0].n).toBe(3)
    expect(writer.healthy).toBe(true)
  })

  it('refuses and counts writes past the buffer bound', async () => {
    const writer = new BatchWriter(t.ctx.sequelize, createLogger('silent'), { flushMs: 50, maxBufferedRows: 5 })
    await setDatabaseAvailable(false)
    const held = writer.write([row(10), row(11), row(12), row(13)], { hold: true })
    await expect(writer.write([row(14), row(15)], { hold: true })).rejects.toBeInstanceOf(BufferFullError)
    expect(writer.refusedRows).toBe(2)
    await setDatabaseAvailable(true)
    expect(await held).toEqual([true, true, true, true])
  })

  it('refuses writes past the buffer bound in bytes, whatever their count', async () => {
    // A row with a 2,000-character source key holds over 4 KB; a 6 KB bound takes one such row, not two.
    const longRow = (i: number): ReadingRow => ({ ...row(20 + i), sourceKey: `import:${'x'.repeat(2000)}:${i}` })
    const writer = new BatchWriter(t.ctx.sequelize, createLogger('silent'), { flushMs: 50, maxBufferedBytes: 6 * 1024 })
    await setDatabaseAvailable(false)
    const held = writer.write([longRow(0)], { hold: true })
    await expect(writer.write([longRow(1)], { hold: true })).rejects.toBeInstanceOf(BufferFullError)
    expect(writer.refusedRows).toBe(1)
    expect(writer.bufferedRows).toBe(1)
    await setDatabaseAvailable(true)
    expect(await held).toEqual([true])
  })
})
