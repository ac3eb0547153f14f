// npm run bench:ingest — sustained and burst MQTT ingest into PostgreSQL, the raw COPY rate of the
// same rows, publish → WebSocket latency, a 30-day series query, and the app's memory. Prints figures.
import { fork } from 'node:child_process'
import { Readable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { cpus, totalmem } from 'node:os'
import { fileURLToPath } from 'node:url'
import pgCopy from 'pg-copy-streams'
import { QueryTypes } from 'sequelize'
import WebSocket from 'ws'
import { testConfig } from '../server/config'
import { startServer } from '../server/server'
import { authService } from '../server/people/auth'
import { seriesService } from '../server/readings/series'
import { benchShop } from './fixtures'

const TANKS = Number(process.env.BENCH_TANKS ?? 1000)
const RATE = Number(process.env.BENCH_RATE ?? 20_000)
const SECONDS = Number(process.env.BENCH_SECONDS ?? 30)

const running = await startServer(
  testConfig({
    databaseUrl: process.env.DATABASE_URL!,
    mqtt: { host: '127.0.0.1', port: 0 },
    logLevel: 'silent',
    // CLUSTER_FANOUT=false measures one instance alone, as a single box runs it (README, Configuration).
    clusterFanout: process.env.CLUSTER_FANOUT !== 'false',
    mail: { fakeSmtpPort: 0, from: 'bench@tankwarden.invalid' },
  }),
)
const { ctx } = running
const mem = (label: string) => {
  const m = process.memoryUsage()
  if (process.env.BENCH_MEMORY)
    console.log(
      `memory ${label}: rss ${Math.round(m.rss / 2 ** 20)} MB, heap used ${Math.round(m.heapUsed / 2 ** 20)} of ${Math.round(m.heapTotal / 2 ** 20)} MB, external ${Math.round(m.external / 2 ** 20)} MB, array buffers ${Math.round(m.arrayBuffers / 2 ** 20)} MB`,
    )
}
mem('after start')
const shop = await benchShop(ctx, TANKS)
mem('after the shop is made')
let stored = 0
ctx.events.on('readings.stored', (rows) => void (stored += rows.length))
const rss: number[] = []
let phaseRss: number[] = []
const rssTimer = setInterval(() => {
  const now = process.memoryUsage().rss
  rss.push(now)
  phaseRss.push(now)
}, 500)

type Done = { sent: number; acked: number; errors: number; elapsedMs: number }
function load(ratePerSecond: number, seconds: number, timeBaseMs: number, devices = shop.devices): Promise<Done> {
  return new Promise((resolve, reject) => {
    const child = fork(fileURLToPath(new URL('./load-mqtt.ts', import.meta.url)), [], { execArgv: ['--import', 'tsx'] })
    child.on('message', (m: { type: string } & Done) => m.type === 'done' && resolve(m))
    child.on('error', reject)
    child.send({ url: `mqtt://127.0.0.1:${running.mqttPort}`, devices, ratePerSecond, seconds, timeBaseMs })
  })
}

async function phase(name: string, offered: number, timeBaseMs: number) {
  const before = stored
  phaseRss = []
  const done = await load(offered, SECONDS, timeBaseMs)
  await ctx.readings.writer.drain()
  const inDb = await ctx.sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM readings WHERE time >= $1 AND time < $2`, {
    bind: [new Date(timeBaseMs), new Date(timeBaseMs + SECONDS * 1000 + 1000)],
    type: QueryTypes.SELECT,
  })
  // From the first publish to the last acknowledgement (each sent only once its rows are committed): the
  // load process's start-up and its 1,000 connections are not ingest time.
  const rate = (stored - before) / (done.elapsedMs / 1000)
  return {
    name,
    offered,
    sent: done.sent,
    acked: done.acked,
    stored: stored - before,
    inDb: inDb[0].n,
    errors: done.errors,
    rate,
    rssMb: Math.max(...phaseRss) / 2 ** 20,
  }
}

// The sustained rate, then a burst at twice it; nothing lost in either.
const base = Date.now() - 3 * 3600_000
const sustained = await phase('sustained', RATE, base)
mem('after sustained')
const burst = await phase('burst ×2', RATE * 2, base + 3600_000)

// The same rows, written with a raw COPY into an empty copy of the table, for comparison.
// LIKE copies the key and indexes but not the foreign key, which is added so both tables do the same checks.
await ctx.sequelize.query('CREATE TABLE readings_copy (LIKE readings INCLUDING ALL)')
await ctx.sequelize.query('ALTER TABLE readings_copy ADD FOREIGN KEY (tank_id) REFERENCES tanks(id) ON DELETE CASCADE')
const copyRows = sustained.inDb
const pool = ctx.sequelize.connectionManager as unknown as {
  getConnection: () => Promise<import('pg').PoolClient>
  releaseConnection: (c: unknown) => Promise<void>
}
const conn = await pool.getConnection()
const copyStart = Date.now()
await pipeline(
  Readable.from(
    (function* () {
      for (let i = 0; i < copyRows; i++)
        yield `d:${shop.devices[i % TANKS].deviceId}\ttemperature\t${new Date(base + i).toISOString()}\t${shop.devices[i % TANKS].tankId}\t25.5\tdevice\n`
    })(),
  ),
  conn.query(pgCopy.from('COPY readings_copy (source_key, metric, time, tank_id, value, source) FROM STDIN')),
)
const copyRate = copyRows / ((Date.now() - copyStart) / 1000)
await pool.releaseConnection(conn)

// Publish → WebSocket receipt at 1,000 readings/s: a keeper's browser watching the whole site.
const owner = await ctx.models.User.create({
  organizationId: shop.organizationId,
  email: 'bench@bench.example',
  name: 'Bench',
  role: 'owner',
  passwordHash: 'x',
})
const session = await authService(ctx).openSession(owner)
const ws = new WebSocket(`ws://127.0.0.1:${running.port}/ws`)
await new Promise((r) => ws.once('open', r))
const latencies: number[] = []
ws.on('message', (data) => {
  const m = JSON.parse(data.toString())
  if (m.type === 'readings') for (const r of m.readings) latencies.push(Date.now() - Date.parse(r.time))
})
ws.send(JSON.stringify({ type: 'auth', token: session.token }))
ws.send(JSON.stringify({ type: 'subscribe', siteId: shop.siteId }))
await new Promise((r) => setTimeout(r, 500))
// Readings stamped "now" at send time, so receipt − time is the whole path.
await new Promise<void>((resolve) => {
  const child = fork(fileURLToPath(new URL('./load-latency.ts', import.meta.url)), [], { execArgv: ['--import', 'tsx'] })
  child.on('message', (m: { type: string }) => m.type === 'done' && resolve())
  child.send({ url: `mqtt://127.0.0.1:${running.mqttPort}`, devices: shop.devices.slice(0, 100), ratePerSecond: 1000, seconds: 15 })
})
await new Promise((r) => setTimeout(r, 1000))
ws.close()

// A 30-day, 1-minute series (43,200 rows) asked for as ≤ 1,000 buckets.
const seriesTank = shop.devices[0].tankId
await ctx.sequelize.query(
  `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
   SELECT 'bench', 'ph', now() - interval '30 days' + g * interval '1 minute', $1, 7 + sin(g / 100.0) / 5, 'device' FROM generate_series(0, 43199) g`,
  { bind: [seriesTank] },
)
await ctx.sequelize.query('ANALYZE readings')
const seriesTimes: number[] = []
for (let i = 0; i < 21; i++) {
  const t = performance.now()
  await seriesService(ctx).series(seriesTank, { metric: 'ph', from: new Date(Date.now() - 30 * 86400_000), to: new Date(), points: 1000 })
  seriesTimes.push(performance.now() - t)
}

clearInterval(rssTimer)
const pct = (xs: number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor((p / 100) * xs.length))] ?? NaN
const f = (n: number) => Math.round(n).toLocaleString('en-GB')
console.log(
  `\nMachine: ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, ${Math.round(totalmem() / 2 ** 30)} GiB, Node ${process.version}; ${TANKS} tanks, ${TANKS} MQTT connections, QoS 1\n`,
)
console.log('| figure | value | target |')
console.log('|---|---|---|')
for (const p of [sustained, burst]) {
  console.log(
    `| ${p.name}: offered ${f(p.offered)}/s for ${SECONDS} s | ${f(p.rate)} readings/s stored (sent ${f(p.sent)}, acked ${f(p.acked)}, in table ${f(p.inDb)}, errors ${p.errors}) | ≥ 20,000/s, nothing lost |`,
  )
}
console.log(
  `| raw COPY of the same ${f(copyRows)} rows | ${f(copyRate)} rows/s; ingest is ${Math.round((sustained.rate / copyRate) * 100)} % of it at the offered rate, ${Math.round((burst.rate / copyRate) * 100)} % at twice it (what the app can take) | ≥ 50 % |`,
)
console.log(
  `| publish → WebSocket at 1,000 readings/s | p50 ${f(pct(latencies, 50))} ms, p99 ${f(pct(latencies, 99))} ms (${f(latencies.length)} readings) | p99 < 100 ms |`,
)
console.log(`| 30-day 1-minute series as ≤ 1,000 buckets | median ${pct(seriesTimes, 50).toFixed(1)} ms | < 50 ms |`)
console.log(
  `| app memory (RSS) while ingesting | sustained max ${f(sustained.rssMb)} MB, burst max ${f(burst.rssMb)} MB, whole run max ${f(Math.max(...rss) / 2 ** 20)} MB | < 300 MB |`,
)
await running.stop()
process.exit(0)
