// One function per figure of `npm run bench`. Each answers plain numbers; suite.ts prints them.
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import pgCopy from 'pg-copy-streams'
import { QueryTypes } from 'sequelize'
import type { Browser } from 'playwright-core'
import type { AppContext } from '../../server/context'
import { createRuleEngine } from '../../server/incidents/engine'
import { silentNotifier } from '../../server/incidents/notifier'
import { incidentsService } from '../../server/incidents/incidents'
import type { StoredReading } from '../../server/platform/events'
import { runLoad, type AppProcess } from './processes'

export type Shop = { organizationId: number; siteId: number; devices: Array<{ deviceId: number; tankId: number; token: string }> }
type LoadDone = { sent: number; acked?: number; accepted?: number; errors: number; elapsedMs: number; ackP50?: number; ackP99?: number }

export const median = (xs: number[]) => percentile(xs, 50)
export function percentile(xs: number[], p: number) {
  const sorted = [...xs].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN
}

/** How long the connections stay open and idle before the first publish, when `whileIdle` is given. */
export const IDLE_MS = 3000

/**
 * MQTT at QoS 1, one connection per device: rows stored per second, publish to the last ack, and
 * publish → PUBACK per message. `whileIdle` runs once every connection is open, before the first publish.
 */
export async function ingestMqtt(app: AppProcess, shop: Shop, rate: number, seconds: number, timeBaseMs: number, whileIdle?: () => Promise<void>) {
  const before = await app.stored()
  let idle: Promise<void> | undefined
  const done = await runLoad<LoadDone>(
    'load-mqtt.ts',
    { url: `mqtt://127.0.0.1:${app.mqttPort}`, devices: shop.devices, ratePerSecond: rate, seconds, timeBaseMs, pauseMs: whileIdle ? IDLE_MS : 0 },
    (m) => void (m.type === 'connected' && whileIdle && (idle = whileIdle())),
  )
  await idle
  const stored = (await app.stored()) - before
  // From the first publish to the last acknowledgement (sent once the rows are committed), not the load process's start-up.
  return {
    rate: stored / (done.elapsedMs / 1000),
    stored,
    sent: done.sent,
    acked: done.acked ?? 0,
    errors: done.errors,
    ackP50: done.ackP50 ?? NaN,
    ackP99: done.ackP99 ?? NaN,
  }
}

/** HTTP, a closed loop of 8 requests of 500 readings in flight: rows stored per second. */
export async function ingestHttp(app: AppProcess, shop: Shop, seconds: number, timeBaseMs: number) {
  const before = await app.stored()
  const done = await runLoad<LoadDone>('load-http.ts', {
    baseUrl: `http://127.0.0.1:${app.port}`,
    devices: shop.devices,
    seconds,
    timeBaseMs,
    concurrency: 8,
    batch: 500,
  })
  const stored = (await app.stored()) - before
  return { rate: stored / (done.elapsedMs / 1000), stored, sent: done.sent, accepted: done.accepted ?? 0, errors: done.errors }
}

/** The same number of rows with a raw COPY into a table with the same key, index and foreign key. */
export async function rawCopy(ctx: AppContext, shop: Shop, rows: number) {
  await ctx.sequelize.query('DROP TABLE IF EXISTS readings_copy')
  await ctx.sequelize.query('CREATE TABLE readings_copy (LIKE readings INCLUDING ALL)')
  await ctx.sequelize.query('ALTER TABLE readings_copy ADD FOREIGN KEY (tank_id) REFERENCES tanks(id) ON DELETE CASCADE')
  const pool = ctx.sequelize.connectionManager as unknown as {
    getConnection: () => Promise<import('pg').PoolClient>
    releaseConnection: (c: unknown) => Promise<void>
  }
  const conn = await pool.getConnection()
  const base = Date.now() - 86400_000
  const n = shop.devices.length
  const t0 = Date.now()
  await pipeline(
    Readable.from(
      (function* () {
        for (let i = 0; i < rows; i++)
          yield `d:${shop.devices[i % n].deviceId}\ttemperature\t${new Date(base + i).toISOString()}\t${shop.devices[i % n].tankId}\t25.5\tdevice\n`
      })(),
    ),
    conn.query(pgCopy.from('COPY readings_copy (source_key, metric, time, tank_id, value, source) FROM STDIN')),
  )
  const rate = rows / ((Date.now() - t0) / 1000)
  await pool.releaseConnection(conn)
  await ctx.sequelize.query('DROP TABLE readings_copy')
  return rate
}

/**
 * Publish → browser: a Chromium page holds the live socket a keeper's screen holds, subscribed to the
 * site; readings are stamped with the moment they are published, so receipt − time is the whole path.
 * The load comes from `devices` connections (the first 100 of the shop unless given), each sending
 * one message with a reading of every one of `metrics` in turn.
 */
export async function latencyInBrowser(
  browser: Browser,
  app: AppProcess,
  shop: Shop,
  token: string,
  ratePerSecond: number,
  seconds: number,
  load: { devices?: Shop['devices']; metrics?: string[]; onConnected?: () => void } = {},
) {
  const page = await browser.newPage()
  await page.goto(`http://127.0.0.1:${app.port}/sign-in`)
  await page.evaluate(
    ({ token, siteId }) =>
      new Promise<void>((resolve) => {
        // Runs in the page; the server's type settings know no DOM, hence the casts.
        const w = globalThis as unknown as { __latencies: number[]; location: { host: string }; WebSocket: typeof import('ws').WebSocket }
        w.__latencies = []
        const ws = new w.WebSocket(`ws://${w.location.host}/ws`)
        ws.onopen = () => {
          ws.send(JSON.stringify({ type: 'auth', token }))
          ws.send(JSON.stringify({ type: 'subscribe', siteId }))
          setTimeout(resolve, 500)
        }
        ws.onmessage = (e) => {
          const m = JSON.parse(String(e.data))
          if (m.type === 'readings') for (const r of m.readings) w.__latencies.push(Date.now() - Date.parse(r.time))
        }
      }),
    { token, siteId: shop.siteId },
  )
  const done = await runLoad<LoadDone>(
    'load-latency.ts',
    { url: `mqtt://127.0.0.1:${app.mqttPort}`, devices: load.devices ?? shop.devices.slice(0, 100), ratePerSecond, seconds, metrics: load.metrics ?? ['ph'] },
    (m) => void (m.type === 'connected' && load.onConnected?.()),
  )
  await new Promise((r) => setTimeout(r, 1000))
  const latencies = await page.evaluate(() => (globalThis as unknown as { __latencies: number[] }).__latencies)
  await page.close()
  return {
    p50: percentile(latencies, 50),
    p99: percentile(latencies, 99),
    count: latencies.length,
    sent: done.sent,
    acked: done.acked ?? 0,
    ackP99: done.ackP99 ?? NaN,
  }
}

export const SERIES_RANGES = [
  ['1 h', 3600_000],
  ['1 day', 86400_000],
  ['7 days', 7 * 86400_000],
  ['30 days', 30 * 86400_000],
  ['1 year', 365 * 86400_000],
] as const

/*
 * The same rows the way the series once read them: every raw reading of the range, grouped into the
 * answer's buckets (or listed, when the answer is raw rows). Timed in the same run for the ratio.
 */
const PLAIN_SCAN_SQL = `
SELECT date_bin($5::integer * interval '1 second', time, '2000-01-03T00:00:00Z'::timestamptz) AS bucket,
       min(value), avg(value), max(value), count(*)
FROM readings
WHERE tank_id = $1 AND metric = $2 AND time >= $3::timestamptz AND time < $4::timestamptz
GROUP BY bucket ORDER BY bucket`
const PLAIN_LIST_SQL = `
SELECT time, value, source FROM readings
WHERE tank_id = $1 AND metric = $2 AND time >= $3::timestamptz AND time < $4::timestamptz
ORDER BY time, source_key`

export type SeriesTiming = { series: number; scan: number; points: number; bucketSeconds: number }

/**
 * A year of 1-minute pH readings on one tank (written into closed hours, so the rollups hold them as
 * the hourly job would have; the raw rows are all kept, so the plain scan can read them), then each
 * range asked for as ≤ 1,000 points over HTTP, `runs` times, next to a plain scan of the same rows.
 */
export async function seriesTimes(ctx: AppContext, app: AppProcess, tankId: number, token: string, runs = 9) {
  await ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'bench-series', 'ph', now() - interval '365 days' + g * interval '1 minute', $1, 7 + sin(g / 100.0) / 5, 'device'
       FROM generate_series(0, 525599) g`,
    { bind: [tankId] },
  )
  await ctx.sequelize.query('VACUUM ANALYZE readings, readings_hourly, readings_daily')
  const out: Record<string, SeriesTiming> = {}
  // A fresh process compiles its code paths and opens pool connections on its first requests: not
  // what a request costs, so a few go unmeasured first.
  for (let i = 0; i < 3; i++) {
    const res = await fetch(`http://127.0.0.1:${app.port}/api/v1/tanks/${tankId}/latest`, { headers: { authorization: `Bearer ${token}` } })
    await res.arrayBuffer()
  }
  // The same sign-in and tank lookup with one small query: what any request of this kind costs here.
  const floorMs: number[] = []
  for (let i = 0; i < runs; i++) {
    const t = performance.now()
    const res = await fetch(`http://127.0.0.1:${app.port}/api/v1/tanks/${tankId}/latest`, { headers: { authorization: `Bearer ${token}` } })
    await res.arrayBuffer()
    floorMs.push(performance.now() - t)
  }
  out.floor = { series: median(floorMs), scan: NaN, points: 0, bucketSeconds: 0 }
  for (const [label, ms] of SERIES_RANGES) {
    const seriesMs: number[] = []
    const scanMs: number[] = []
    let shape = { points: 0, bucketSeconds: 0 }
    for (let i = 0; i < runs; i++) {
      const to = new Date()
      const from = new Date(to.getTime() - ms)
      let t = performance.now()
      const res = await fetch(
        `http://127.0.0.1:${app.port}/api/v1/tanks/${tankId}/series?metric=ph&from=${from.toISOString()}&to=${to.toISOString()}&points=1000`,
        {
          headers: { authorization: `Bearer ${token}` },
        },
      )
      const text = await res.text()
      seriesMs.push(performance.now() - t)
      if (!res.ok) throw new Error(`series ${label}: HTTP ${res.status}`)
      const body = JSON.parse(text) as { bucketSeconds: number; points: unknown[]; raw: unknown[] }
      shape = { points: body.bucketSeconds ? body.points.length : body.raw.length, bucketSeconds: body.bucketSeconds }
      t = performance.now()
      if (body.bucketSeconds) await ctx.sequelize.query(PLAIN_SCAN_SQL, { bind: [tankId, 'ph', from, to, body.bucketSeconds], type: QueryTypes.SELECT })
      else await ctx.sequelize.query(PLAIN_LIST_SQL, { bind: [tankId, 'ph', from, to], type: QueryTypes.SELECT })
      scanMs.push(performance.now() - t)
    }
    out[label] = { series: median(seriesMs), scan: median(scanMs), ...shape }
  }
  return out
}

/** Six hours of five-minute temperature and pH readings on every tank, each its own: what a wall shows as trends and latest values. */
export async function wallHistory(ctx: AppContext, shop: Shop) {
  await ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'd:' || d, m.metric, date_trunc('minute', now()) - g * interval '5 minutes', t, m.base + ((g * 7 + d * 13) % 23) / 20.0, 'device'
       FROM unnest($1::int[], $2::int[]) u(t, d), generate_series(0, 71) g, (VALUES ('temperature', 25.5), ('ph', 7.1)) m(metric, base)
     ON CONFLICT DO NOTHING`,
    { bind: [shop.devices.map((d) => d.tankId), shop.devices.map((d) => d.deviceId)] },
  )
  await ctx.sequelize.query('ANALYZE readings')
}

/** Navigation to a display link → the first page of tiles drawn with their data (a frame painted), in a 1920×1080 Chromium. */
export async function wallRender(browser: Browser, app: AppProcess, link: string) {
  const times: number[] = []
  for (let i = 0; i < 3; i++) {
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } })
    const page = await context.newPage()
    const t = performance.now()
    await page.goto(`http://127.0.0.1:${app.port}${link}`)
    await page.locator('article').first().waitFor({ timeout: 30_000 })
    // Two animation frames later the tiles have been painted. Runs in the page; the server's type settings know no DOM.
    await page.evaluate(() => {
      const frame = (globalThis as unknown as { requestAnimationFrame: (f: () => void) => void }).requestAnimationFrame
      return new Promise<void>((painted) => frame(() => frame(painted)))
    })
    times.push(performance.now() - t)
    // Where the time went: when the page asked for the wall's data and when the answer was in (ms from navigation).
    const api = await page.evaluate(() => {
      const entries = (
        globalThis as unknown as {
          performance: { getEntriesByType: (k: string) => Array<{ name: string; startTime: number; responseStart: number; responseEnd: number }> }
        }
      ).performance.getEntriesByType('resource')
      const wall = entries.find((e) => /\/api\/v1\/sites\/\d+\/wall(\?|$)/.test(e.name))
      return wall ? [wall.startTime, wall.responseStart, wall.responseEnd].map(Math.round) : null
    })
    if (api) console.log(`  wall run ${i + 1}: ${Math.round(times[i]!)} ms; its data asked at ${api[0]} ms, first byte ${api[1]} ms, all in ${api[2]} ms`)
    await context.close()
  }
  return median(times)
}

export type Transfer = { path: string; bytes: number; encoding: string }

/**
 * What a display's first visit to its wall link moves over the network: every response's body as
 * sent (compressed where the server compressed it), from the navigation until the network is idle
 * after the first tiles are drawn. Built files and API answers are counted apart.
 */
export async function wallBytes(browser: Browser, app: AppProcess, link: string) {
  const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } })
  const page = await context.newPage()
  const pending: Array<Promise<Transfer>> = []
  page.on('requestfinished', (request) => {
    pending.push(
      Promise.all([request.sizes(), request.response()]).then(([sizes, response]) => ({
        path: new URL(request.url()).pathname,
        bytes: sizes.responseBodySize,
        encoding: response?.headers()['content-encoding'] ?? 'identity',
      })),
    )
  })
  await page.goto(`http://127.0.0.1:${app.port}${link}`)
  await page.locator('article').first().waitFor({ timeout: 30_000 })
  // The fonts are asked for once text is drawn in them; then nothing more until the next refresh.
  await page.evaluate(() => (globalThis as unknown as { document: { fonts: { ready: Promise<unknown> } } }).document.fonts.ready.then(() => undefined))
  await page.waitForLoadState('networkidle')
  await page.waitForTimeout(1000)
  const transfers = await Promise.all(pending)
  await context.close()
  const files = transfers.filter((t) => !t.path.startsWith('/api/'))
  const api = transfers.filter((t) => t.path.startsWith('/api/'))
  const sum = (list: Transfer[]) => list.reduce((a, t) => a + t.bytes, 0)
  return { filesKb: sum(files) / 1024, apiKb: sum(api) / 1024, files: files.sort((a, b) => b.bytes - a.bytes), api }
}

/** The engine's work per reading with every tank's rules loaded: readings fed as the bus would. */
export async function engineCost(ctx: AppContext, shop: Shop, readings: number) {
  const engine = createRuleEngine(
    ctx,
    incidentsService(ctx, silentNotifier, { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }),
  )
  await engine.start()
  // Later than anything the ingest figures stored, so no reading counts as late.
  const start = Date.now() - 5 * 60_000
  const rows: StoredReading[] = Array.from({ length: readings }, (_, i) => {
    const d = shop.devices[i % shop.devices.length]
    return {
      sourceKey: `d:${d.deviceId}`,
      metric: 'temperature',
      time: new Date(start + Math.floor(i / shop.devices.length) * 1000),
      tankId: d.tankId,
      value: 25 + (i % 10) / 10,
      source: 'device',
    }
  })
  const t = performance.now()
  for (let i = 0; i < rows.length; i += 5000) ctx.events.emit('readings.stored', rows.slice(i, i + 5000))
  await engine.settle()
  const ms = performance.now() - t
  await engine.stop()
  return (ms * 1000) / readings // µs per reading
}

/** Ten site-wide temperature rules that hold quietly for steady readings: every reading meets ten. */
export async function tenRulesPerTank(ctx: AppContext, shop: Shop) {
  const specs = [
    { kind: 'above', metric: 'temperature', limit: 60, holdMinutes: 10, clearMargin: 0.5 },
    { kind: 'above', metric: 'temperature', limit: 70, holdMinutes: 0, clearMargin: 0 },
    { kind: 'below', metric: 'temperature', limit: 5, holdMinutes: 10, clearMargin: 0.5 },
    { kind: 'below', metric: 'temperature', limit: 1, holdMinutes: 0, clearMargin: 0 },
    { kind: 'outside', metric: 'temperature', min: 2, max: 60, holdMinutes: 15, clearMargin: 0.5 },
    { kind: 'outside', metric: 'temperature', min: 1, max: 65, holdMinutes: 30, clearMargin: 0.5 },
    { kind: 'rate', metric: 'temperature', maxChange: 20, windowMinutes: 60 },
    { kind: 'rate', metric: 'temperature', maxChange: 30, windowMinutes: 180 },
    { kind: 'quiet', metric: 'temperature', quietMinutes: 10_000 },
    { kind: 'quiet', metric: 'temperature', quietMinutes: 9_000 },
  ]
  await ctx.sequelize.query(
    `INSERT INTO watch_rules (organization_id, site_id, name, severity, spec)
     SELECT $1, $2, 'Bench rule ' || ordinality, 'warning', spec FROM unnest($3::jsonb[]) WITH ORDINALITY AS u(spec, ordinality)`,
    { bind: [shop.organizationId, shop.siteId, specs.map((s) => JSON.stringify(s))], type: QueryTypes.INSERT },
  )
}
