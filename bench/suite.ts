// npm run bench — every figure at 10, 100, 200 and 1,000 tanks, side by side, with the targets and
// how each grows. The app runs in a process of its own (its memory is the app's alone); load comes
// from other processes; the browser figures from Debian's Chromium.
// BENCH_ONLY=wall,series (any of ingest, latency, wall, series, engine, realistic) runs only those parts.
// BENCH_SECONDS (default 60) is how long the sustained MQTT load runs; shorten it for quick runs.
import { cpus, totalmem } from 'node:os'
import { existsSync } from 'node:fs'
import { execFileSync } from 'node:child_process'
import { chromium } from 'playwright-core'
import { CHROMIUM_FLAGS } from '../scripts/lib/chromium.mjs'
import { QueryTypes } from 'sequelize'
import { testConfig } from '../server/config'
import { closeContext, createContext } from '../server/bootstrap'
import { migrate } from '../server/platform/db/migrate'
import { authService } from '../server/people/auth'
import { wallService } from '../server/sites/wall'
import { benchShop } from './fixtures'
import { startAppProcess, sampleRss } from './suite/processes'
import {
  IDLE_MS,
  engineCost,
  ingestHttp,
  ingestMqtt,
  latencyInBrowser,
  rawCopy,
  SERIES_RANGES,
  seriesTimes,
  tenRulesPerTank,
  wallBytes,
  wallHistory,
  wallRender,
} from './suite/measures'

const SIZES = (process.env.BENCH_SIZES ?? '10,100,200,1000').split(',').map(Number)
// Offered above what the app can store on this machine kind, so the stored rate is its capacity.
const RATE = Number(process.env.BENCH_RATE ?? 40_000)
const SECONDS = Number(process.env.BENCH_SECONDS ?? 60)
/** How long after the load stops the app's memory is read again. */
const SETTLE_SECONDS = Number(process.env.BENCH_SETTLE_SECONDS ?? 60)
/** The large point at realistic rates: 4 metrics every 10 s from each tank's own connection. */
const REALISTIC_TANKS = Number(process.env.BENCH_REALISTIC_TANKS ?? 5000)
const REALISTIC_METRICS = ['temperature', 'ph', 'conductivity', 'oxygen']
const REALISTIC_RATE = (REALISTIC_TANKS * REALISTIC_METRICS.length) / 10
const databaseUrl = process.env.DATABASE_URL!
const PARTS = ['ingest', 'latency', 'wall', 'series', 'engine', 'realistic']
const only = (process.env.BENCH_ONLY ?? PARTS.join(',')).split(',').filter(Boolean)
for (const part of only) if (!PARTS.includes(part)) throw new Error(`BENCH_ONLY: no part named ${part} (parts: ${PARTS.join(', ')})`)
const runs = (part: string) => only.includes(part)

// The wall's byte figure is about the client as it is now: build it afresh (BENCH_SKIP_BUILD=1 keeps dist as it is).
if (!process.env.BENCH_SKIP_BUILD || !existsSync('dist/index.html')) {
  // A production build whatever this process runs under (bench.mjs sets NODE_ENV=test), as `npm start` serves it.
  execFileSync('node_modules/.bin/vite', ['build', '--logLevel', 'warn'], { stdio: 'inherit', env: { ...process.env, NODE_ENV: 'production' } })
}
const browser = await chromium.launch({
  executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
  headless: true,
  args: CHROMIUM_FLAGS,
})
const SERIES_RUNS = Number(process.env.BENCH_SERIES_RUNS ?? 9)

type Figures = Record<string, number>
const results: Figures[] = []
const sizedParts = PARTS.filter((p) => p !== 'realistic' && runs(p))
for (const tanks of sizedParts.length ? SIZES : []) {
  const ctx = createContext(testConfig({ databaseUrl, logLevel: 'silent' }))
  await ctx.sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public')
  await migrate(ctx.sequelize)
  const shop = await benchShop(ctx, tanks)
  await tenRulesPerTank(ctx, shop)
  const owner = await ctx.models.User.create({
    organizationId: shop.organizationId,
    email: 'bench@bench.example',
    name: 'Bench',
    role: 'owner',
    passwordHash: 'x',
  })
  const { token } = await authService(ctx).openSession(owner)
  const actor = { kind: 'user' as const, userId: owner.id, organizationId: shop.organizationId, role: 'owner' as const, siteIds: null, jti: 'bench' }
  const { link } = await wallService(ctx).createCredential(actor as never, shop.siteId, 'Bench display')

  console.log(`— ${tanks} tanks`)
  const app = await startAppProcess(databaseUrl)
  const rss = sampleRss(app.pid)
  const f: Figures = { tanks }
  if (runs('ingest')) {
    // What is alive in the app with every tank's connection open and idle, against before any connection.
    const idle = await app.memory(true)
    let connected = idle
    let mark = rss.cpuMark()
    // Readings of the last half hour, as live sensors send them: older ones are late readings, which
    // also merge into the hourly and daily rollups as they are stored (a rarer, slower path).
    const mqtt = await ingestMqtt(app, shop, RATE, SECONDS, Date.now() - 20 * 60_000, async () => {
      const since = Date.now()
      connected = await app.memory(true)
      // The CPU from the first publish on (the load waits IDLE_MS after connecting).
      await new Promise((r) => setTimeout(r, Math.max(0, IDLE_MS - (Date.now() - since))))
      mark = rss.cpuMark()
    })
    f.cpu = rss.cpuShareSince(mark)
    // The app's CPU time per stored reading: what bounds one instance's capacity, and far steadier than the rate on a busy machine.
    f.cpuPerReading = (f.cpu / 100) * (1e6 / mqtt.rate)
    f.mqtt = mqtt.rate
    f.mqttLost = mqtt.acked - mqtt.stored
    f.perTankKb = ((connected.heapUsed + connected.external - idle.heapUsed - idle.external) * 1024) / tanks
    console.log(
      `  live memory (MB, after a full collection): idle ${(idle.heapUsed + idle.external).toFixed(1)}, ${tanks} connections open ${(connected.heapUsed + connected.external).toFixed(1)} (heap ${connected.heapUsed.toFixed(1)}, external ${connected.external.toFixed(1)}); RSS ${idle.rss.toFixed(0)} → ${connected.rss.toFixed(0)}`,
    )
    console.log(
      `  MQTT sustained: ${mqtt.sent} sent, ${mqtt.acked} acked, ${mqtt.stored} stored, ${mqtt.errors} errors; publish → PUBACK p50 ${mqtt.ackP50.toFixed(0)} ms, p99 ${mqtt.ackP99.toFixed(0)} ms`,
    )
    // Half the rate the app just sustained: how long a device waits for its acknowledgement when the app is not saturated.
    const half = await ingestMqtt(app, shop, mqtt.rate / 2, Math.min(SECONDS, 20), Date.now() - 14 * 60_000)
    f.halfAckP99 = half.ackP99
    f.mqttLost += half.acked - half.stored
    const http = await ingestHttp(app, shop, Math.min(SECONDS, 15), Date.now() - 8 * 60_000)
    f.http = http.rate
    f.rss = rss.peakMb()
    f.copy = await rawCopy(ctx, shop, mqtt.stored)
    // Table and indexes together, for the disk a year of readings takes.
    const [size] = await ctx.sequelize.query<{ bytes: number }>(
      `SELECT pg_total_relation_size('readings')::float8 / greatest(count(*), 1) AS bytes FROM readings`,
      { type: QueryTypes.SELECT },
    )
    f.bytesPerRow = size.bytes
    await new Promise((r) => setTimeout(r, SETTLE_SECONDS * 1000))
    f.rssAfter = rss.nowMb()
    const after = await app.memory()
    console.log(
      `  a minute after the load: RSS ${after.rss.toFixed(0)} MB, heap ${after.heapUsed.toFixed(1)} of ${after.heapTotal.toFixed(1)} MB, external ${after.external.toFixed(1)} MB`,
    )
  }
  if (runs('latency')) {
    const latency = await latencyInBrowser(browser, app, shop, token, 1000, 10)
    f.p50 = latency.p50
    f.p99 = latency.p99
  }
  if (runs('wall')) {
    await wallHistory(ctx, shop)
    f.wall = await wallRender(browser, app, link)
    const bytes = await wallBytes(browser, app, link)
    f.wallKb = bytes.filesKb
    f.wallApiKb = bytes.apiKb
    console.log(`  wall data: ${bytes.api.map((t) => `${t.path} ${(t.bytes / 1024).toFixed(1)} KB ${t.encoding}`).join(', ')}`)
    console.log(`  wall files: ${bytes.files.map((t) => `${t.path.replace(/^\/assets\//, '')} ${(t.bytes / 1024).toFixed(1)} KB ${t.encoding}`).join(', ')}`)
  }
  if (runs('series')) {
    const series = await seriesTimes(ctx, app, shop.devices[0].tankId, token, SERIES_RUNS)
    f.requestFloor = series.floor.series
    console.log(`  GET /tanks/:id/latest (the request's own cost): ${series.floor.series.toFixed(1)} ms`)
    for (const [label] of SERIES_RANGES) {
      f[`series ${label}`] = series[label].series
      f[`scan ${label}`] = series[label].scan
      console.log(
        `  series ${label}: ${series[label].series.toFixed(1)} ms for ${series[label].points} ${series[label].bucketSeconds ? `buckets of ${series[label].bucketSeconds} s` : 'raw rows'}; plain scan of the same raw rows ${series[label].scan.toFixed(1)} ms; ratio ${(series[label].series / series[label].scan).toFixed(2)}; target < 50 ms`,
      )
    }
  }
  if (runs('engine')) f.engine = await engineCost(ctx, shop, 50_000)
  f.rssAll = rss.peakMb()
  rss.stop()
  await app.stop()
  await closeContext(ctx)
  results.push(f)
  console.log(`  ${JSON.stringify(Object.fromEntries(Object.entries(f).map(([k, v]) => [k, Math.round(v * 10) / 10])))}`)
}

/** The large point at realistic rates: RSS, the app's CPU, publish → screen and publish → PUBACK. */
let realistic: Figures | null = null
if (runs('realistic')) {
  const ctx = createContext(testConfig({ databaseUrl, logLevel: 'silent' }))
  await ctx.sequelize.query('DROP SCHEMA public CASCADE; CREATE SCHEMA public')
  await migrate(ctx.sequelize)
  const shop = await benchShop(ctx, REALISTIC_TANKS)
  await tenRulesPerTank(ctx, shop)
  const owner = await ctx.models.User.create({
    organizationId: shop.organizationId,
    email: 'bench@bench.example',
    name: 'Bench',
    role: 'owner',
    passwordHash: 'x',
  })
  const { token } = await authService(ctx).openSession(owner)
  console.log(`— ${REALISTIC_TANKS} tanks at ${REALISTIC_RATE} readings/s (${REALISTIC_METRICS.length} metrics every 10 s per tank)`)
  const app = await startAppProcess(databaseUrl)
  const rss = sampleRss(app.pid)
  let mark = rss.cpuMark()
  const seconds = Number(process.env.BENCH_REALISTIC_SECONDS ?? SECONDS)
  const before = await app.stored()
  const latency = await latencyInBrowser(browser, app, shop, token, REALISTIC_RATE, seconds, {
    devices: shop.devices,
    metrics: REALISTIC_METRICS,
    // CPU from the first publish: opening the connections is not the steady state.
    onConnected: () => void (mark = rss.cpuMark()),
  })
  const cpu = rss.cpuShareSince(mark)
  const stored = (await app.stored()) - before
  // The app's CPU per tank at this rate, and so how many tanks keep it at half of one core (its JavaScript runs on one).
  const cpuPerTank = (rss.cpuSecondsSince(mark) / stored) * (REALISTIC_RATE / REALISTIC_TANKS)
  const tanksAtHalfCore = 0.5 / cpuPerTank
  realistic = {
    tanks: REALISTIC_TANKS,
    rss: rss.peakMb(),
    cpu,
    tanksAtHalfCore,
    p99: latency.p99,
    ackP99: latency.ackP99,
    lost: latency.acked - stored,
    stored,
  }
  console.log(`  ${latency.sent} sent, ${latency.acked} acked, ${stored} stored; ${JSON.stringify(realistic)}`)
  rss.stop()
  await app.stop()
  await closeContext(ctx)
}
await browser?.close()

const n = (v: number, digits = 0) => (Number.isFinite(v) ? v.toLocaleString('en-GB', { maximumFractionDigits: digits, minimumFractionDigits: digits }) : '—')
/** How a figure grows from the smallest to the largest size, as the exponent k in cost ∝ tanks^k. */
function growth(key: string) {
  const a = results[0]
  const b = results[results.length - 1]
  if (results.length < 2 || !(a[key] > 0) || !(b[key] > 0)) return ''
  const k = Math.log(b[key] / a[key]) / Math.log(b.tanks / a.tanks)
  return `${k >= 0 ? '+' : ''}${k.toFixed(2)}${k > 1.1 ? ' (faster than linear)' : ''}`
}
const rows: Array<[string, string, (f: Figures) => string, string]> = [
  [
    `MQTT ingest, QoS 1, one connection per tank, ${SECONDS} s sustained (readings/s stored)`,
    'mqtt',
    (f) => `${n(f.mqtt)}${f.mqttLost ? ` (${n(f.mqttLost)} acked but not stored!)` : ''}`,
    `offered ${n(RATE)}`,
  ],
  ['HTTP ingest, 8 × 500-reading requests in flight (readings/s)', 'http', (f) => n(f.http), '—'],
  ['raw COPY of the same rows (rows/s)', 'copy', (f) => n(f.copy), '—'],
  ['app CPU during the sustained MQTT ingest (% of one core)', 'cpu', (f) => n(f.cpu), '—'],
  ['app CPU time per reading stored over MQTT (µs)', 'cpuPerReading', (f) => n(f.cpuPerReading, 1), '—'],
  ['MQTT ingest as a share of raw COPY', 'ratio', (f) => `${n((100 * f.mqtt) / f.copy)} %`, '≥ 80 %'],
  ['publish → PUBACK at half the sustained rate, p99 (ms)', 'halfAckP99', (f) => n(f.halfAckP99), '< 100'],
  ['publish → browser at 1,000 readings/s, p50 (ms)', 'p50', (f) => n(f.p50), '—'],
  ['publish → browser at 1,000 readings/s, p99 (ms)', 'p99', (f) => n(f.p99), '< 100'],
  ...SERIES_RANGES.map(
    ([label]) =>
      [
        `series of a year of 1-minute rows, ${label} as ≤ 1,000 points (ms, median of ${SERIES_RUNS}; plain scan of the same raw rows; ratio)`,
        `series ${label}`,
        (f: Figures) => `${n(f[`series ${label}`], 1)} (scan ${n(f[`scan ${label}`], 1)}; ${n(f[`series ${label}`] / f[`scan ${label}`], 2)}×)`,
        '< 50',
      ] as [string, string, (f: Figures) => string, string],
  ),
  [`GET /tanks/:id/latest, the same sign-in and tank lookup as a series (ms, median of ${SERIES_RUNS})`, 'requestFloor', (f) => n(f.requestFloor, 1), '—'],
  ['wall display link → first page of tiles drawn (ms, median of 3)', 'wall', (f) => n(f.wall), '< 1,000 at 200 tanks, < 1,500 at 1,000'],
  ['wall route bytes (compressed): built files a display loads (KB)', 'wallKb', (f) => n(f.wallKb), '< 350'],
  ['wall data on first load, GET /sites/:id/wall (KB as sent)', 'wallApiKb', (f) => n(f.wallApiKb), '—'],
  ['rule engine, 10 rules per tank (µs per reading)', 'engine', (f) => n(f.engine, 1), '—'],
  ['PostgreSQL disk per stored reading, table and indexes (bytes)', 'bytesPerRow', (f) => n(f.bytesPerRow), '—'],
  ['app memory while ingesting, peak RSS (MB)', 'rss', (f) => n(f.rss), '< 300'],
  [`app memory ${SETTLE_SECONDS} s after the load stops, RSS (MB)`, 'rssAfter', (f) => n(f.rssAfter), '< 250'],
  ['app live memory per tank, its connection open and idle (KB, heap + external after a full collection)', 'perTankKb', (f) => n(f.perTankKb, 1), '—'],
  ['app memory over the whole run, peak RSS (MB)', 'rssAll', (f) => n(f.rssAll), '—'],
]
console.log(
  `\nMachine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, ${Math.round(totalmem() / 2 ** 30)} GiB, Node ${process.version}, PostgreSQL on the same machine; ${SECONDS} s of MQTT load per size\n`,
)
if (results.length) console.log(`| figure | ${results.map((f) => `${n(f.tanks)} tanks`).join(' | ')} | target | growth k (∝ tanks^k) |`)
if (results.length) console.log(`|---|${results.map(() => '---').join('|')}|---|---|`)
for (const f of results) if ('mqtt' in f) f.ratio = (100 * f.mqtt) / f.copy
for (const [label, key, show, target] of rows)
  if (results.some((f) => key in f || (key === 'ratio' && 'mqtt' in f)))
    console.log(`| ${label} | ${results.map(show).join(' | ')} | ${target} | ${growth(key)} |`)
if (realistic) {
  const r = realistic
  console.log(
    `\n| ${n(r.tanks)} tanks, ${REALISTIC_METRICS.length} metrics every 10 s each (${n(REALISTIC_RATE)} readings/s), one MQTT connection per tank | value | target |`,
  )
  console.log('|---|---|---|')
  console.log(`| readings stored; acked but not stored | ${n(r.stored)}; ${n(r.lost)} | 0 lost |`)
  console.log(`| app peak RSS (MB) | ${n(r.rss)} | — |`)
  console.log(`| app CPU (% of one core; the machine has ${cpus().length}) | ${n(r.cpu)} | — |`)
  console.log(`| tanks at this rate one instance serves at 50 % of one core (its CPU per stored reading) | ${n(r.tanksAtHalfCore)} | — |`)
  console.log(`| publish → browser p99 (ms) | ${n(r.p99)} | < 100 |`)
  console.log(`| publish → PUBACK p99 (ms) | ${n(r.ackP99)} | — |`)
}
process.exit(0)
