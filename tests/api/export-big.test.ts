import { createServer, type Server } from 'node:http'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { startTestApp, type TestOrg } from '../helpers/app'
import { insertRow, tankValues } from './export-helpers'
import { waitFor } from '../helpers/wait'
import { listenOnFreePort } from '../helpers/ports'

// 200 000 one-minute readings: the export must stream them (a cursor batch at a time, waiting for
// a slow client) rather than build the file in memory. No timing is asserted; figures are printed.
const ROWS = 200_000
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number
let server: Server
let base: string

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Big Export Aquatics')
  tankId = await insertRow(t.ctx, 'tanks', tankValues(org.organizationId, org.siteIds[0]!, 'Breeding rack'))
  await t.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'i:1', 'temperature', timestamptz '2026-01-01T00:00:00Z' + g * interval '1 minute', $1, 24 + (g % 200) / 100.0, 'import'
     FROM generate_series(0, $2 - 1) AS g`,
    { bind: [tankId, ROWS] },
  )
  server = createServer(t.app)
  base = `${await listenOnFreePort(server)}/api/v1`
}, 120_000)
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve))
  await t.close()
})

const openFetches = async () =>
  (
    (await t.ctx.sequelize.query(
      "SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state = 'idle in transaction' AND query LIKE 'FETCH % FROM export_cursor_%'",
      { type: QueryTypes.SELECT },
    )) as Array<{ n: number }>
  )[0]!.n

describe('a big readings export', () => {
  it('streams every row, and holds the cursor open while the client is not reading', async () => {
    const res = await fetch(`${base}/tanks/${tankId}/exports/readings.csv?from=2026-01-01T00:00:00Z&to=2026-06-01T00:00:00Z`, {
      headers: { Authorization: `Bearer ${org.users.viewer.token}` },
    })
    expect(res.status).toBe(200)
    const reader = res.body!.getReader()
    const decoder = new TextDecoder()
    const first = await reader.read()

    // The client stops reading: the server must be waiting part way, its cursor still open.
    expect(await waitFor(openFetches, (waiting) => waiting > 0, 5000, 100)).toBe(1)

    const heapBefore = process.memoryUsage().heapUsed
    let heapPeak = heapBefore
    let bytes = first.value!.length
    let pending = decoder.decode(first.value, { stream: true })
    let lines = 0
    let last = ''
    for (;;) {
      const chunk = await reader.read()
      if (chunk.done) break
      bytes += chunk.value.length
      pending += decoder.decode(chunk.value, { stream: true })
      const parts = pending.split('\r\n')
      pending = parts.pop()!
      lines += parts.length
      if (parts.length) last = parts[parts.length - 1]!
      heapPeak = Math.max(heapPeak, process.memoryUsage().heapUsed)
    }
    expect(pending + decoder.decode()).toBe('')
    expect(lines).toBe(ROWS + 1)
    // g = 199 999 minutes after New Year: 19 May 2026 21:19 UTC, summer time in Berlin (+02:00).
    expect(last).toBe('2026-05-19T23:19:00+02:00,Breeding rack,temperature,25.99,C,import')
    console.log(
      `exported ${ROWS} readings, ${(bytes / 1e6).toFixed(1)} MB; heap in use (garbage included) rose at most ${((heapPeak - heapBefore) / 1e6).toFixed(1)} MB while streaming`,
    )
    expect(await openFetches()).toBe(0)
  }, 120_000)
})
