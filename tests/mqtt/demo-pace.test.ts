// The demo's first half hour at the default speed, played in about a minute: the seeded demo shop,
// the simulator's nodes with the demo faults over real MQTT, and the watch-rule engine, all driven
// by one injected clock that steps ten seconds (one simulator interval, one engine tick) at a time.
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer, type Server } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../server/app'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { startEmbeddedBroker, type EmbeddedBroker } from '../../server/mqtt/broker'
import { createRuleEngine, type RuleEngine } from '../../server/incidents/engine'
import { createMailNotifier } from '../../server/incidents/mail-notifier'
import { seedDemoIfEmpty } from '../../server/demo/demo'
import { DEMO_PASSWORD, DEMO_USERS } from '../../server/demo/demo-scenario'
import { incidentsService } from '../../server/incidents/incidents'
import { createApiClient } from '../../simulator/api-client'
import { demoScenarios } from '../../simulator/model/scenarios'
import { buildNodes } from '../../simulator/nodes'
import { provisionDevices } from '../../simulator/provision'
import { runTick, type SimulatedNode } from '../../simulator/runner'
import { createTestDatabase } from '../helpers/db'
import { listenOnFreePort } from '../helpers/ports'

/** What `npm start` runs the simulator at (scripts/start.mjs) and the intervals it and the engine use. */
const SPEED = 20
const INTERVAL_MS = 10_000
const HALF_HOUR_MS = 30 * 60_000
const HOUR_MS = 60 * 60_000
/** The longest the test plays: the hour's faults and five minutes for the last to clear. */
const PLAYED_MS = HOUR_MS + 5 * 60_000

let db: Awaited<ReturnType<typeof createTestDatabase>>
let dataDir: string
let ctx: AppContext
let http: Server
let broker: EmbeddedBroker
let engine: RuleEngine
let nodes: SimulatedNode[] = []
let clock = Date.now()
let startedAt = 0

const count = async (sql: string, bind: unknown[] = []) => (await ctx.sequelize.query<{ n: number }>(sql, { bind, type: QueryTypes.SELECT }))[0]!.n

beforeAll(async () => {
  db = await createTestDatabase()
  dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-pace-'))
  // Readings are stamped with the injected clock, which runs up to PLAYED_MS ahead of the real one;
  // a tighter limit refuses the last minutes' readings and freezes every rule where it stood.
  const config = testConfig({ databaseUrl: db.url, dataDir, readingLimits: { maxFutureSeconds: PLAYED_MS / 1000 + 600, maxAgeDays: 400 } })
  ctx = createContext(config)
  expect(await seedDemoIfEmpty(ctx)).toBe(true)
  http = createServer(createApp(ctx))
  const baseUrl = await listenOnFreePort(http)
  broker = await startEmbeddedBroker(ctx, { host: '127.0.0.1', port: 0 })
  ctx.incidents.notifier = createMailNotifier(ctx)
  clock = Date.now()
  startedAt = clock
  engine = createRuleEngine(ctx, incidentsService(ctx, ctx.incidents.notifier, config.incidentTiming), { now: () => clock })
  await engine.start()
  const tanks = await provisionDevices(createApiClient(baseUrl), { email: DEMO_USERS[0].email, password: DEMO_PASSWORD, intervalSeconds: INTERVAL_MS / 1000 })
  nodes = await buildNodes(
    { transport: 'mqtt', url: baseUrl, mqttUrl: `mqtt://127.0.0.1:${broker.port}`, scenarios: demoScenarios(SPEED), seed: 1, speed: SPEED },
    tanks,
    () => {},
    startedAt,
  )
}, 180_000)

afterAll(async () => {
  await Promise.allSettled(nodes.map((n) => n.transport.close()))
  await engine?.stop()
  await broker?.close()
  http?.closeAllConnections()
  await new Promise((resolve) => http?.close(resolve))
  if (ctx) await closeContext(ctx)
  await db?.drop()
  rmSync(dataDir, { recursive: true, force: true })
})

describe('the live demo at the default speed', () => {
  it('opens nothing from the seeded month when the engine starts', async () => {
    // The shop's and fish room's nine live tanks and the clients' three.
    expect(nodes).toHaveLength(12)
    expect(await count(`SELECT count(*)::int AS n FROM incidents WHERE state <> 'resolved'`)).toBe(0)
    expect(await count('SELECT count(*)::int AS n FROM mail_outbox')).toBe(0)
  })

  it('opens at most four incidents and six mails in its first half hour, and shows at least one open and clear', async () => {
    await playUntil(HALF_HOUR_MS)
    const { incidents, mails } = await since('first 30 min')
    expect(incidents.length).toBeLessThanOrEqual(4)
    expect(mails.length).toBeLessThanOrEqual(6)
    // A newcomer sees the quiet sensor's warning open and clear by itself.
    expect(incidents.some((i) => i.tank === 'Breeding cylinder C1' && i.state === 'resolved')).toBe(true)
  }, 300_000)

  it('plays every fault once in the hour, the heater alarm escalating, and each clearing by itself', async () => {
    await playUntil(PLAYED_MS)
    const { incidents } = await since('first 65 min')
    const once = new Map<string, number>()
    for (const i of incidents) once.set(`${i.tank}: ${i.title}`, (once.get(`${i.tank}: ${i.title}`) ?? 0) + 1)
    for (const [what, n] of once) expect(n, what).toBe(1)
    expect(new Set(incidents.map((i) => i.tank))).toEqual(new Set(['Breeding cylinder C1', 'Quarantine Q1', 'Display 2 — planted scape', 'Sales row A1']))
    const heater = incidents.find((i) => i.tank === 'Quarantine Q1')!
    expect(heater.escalation_level).toBe(1)
    for (const i of incidents) expect(i.state, `${i.tank}: ${i.title}`).toBe('resolved')
  }, 300_000)
})

/** Steps the clock ten seconds at a time: every node sends, the engine takes it in, then ticks. */
async function playUntil(untilMs: number) {
  for (let tick = Math.round((clock - startedAt) / INTERVAL_MS) + 1; clock - startedAt < untilMs; tick++) {
    clock = startedAt + tick * INTERVAL_MS
    await runTick(nodes, tick, (INTERVAL_MS / 1000) * SPEED, new Date(clock))
    await engine.settle()
    await engine.tick(clock)
  }
}

async function since(label: string) {
  const incidents = await ctx.sequelize.query<{
    tank: string
    title: string
    state: string
    escalation_level: number
    opened_at: Date
    resolved_at: Date | null
  }>(
    `SELECT t.name AS tank, i.title, i.state, i.escalation_level, i.opened_at, i.resolved_at FROM incidents i JOIN tanks t ON t.id = i.tank_id
     WHERE i.opened_at >= $1 ORDER BY i.opened_at`,
    { bind: [new Date(startedAt)], type: QueryTypes.SELECT },
  )
  const mails = await ctx.sequelize.query<{ kind: string }>('SELECT kind FROM mail_outbox ORDER BY id', { type: QueryTypes.SELECT })
  const minute = (d: Date | null) => (d ? `${((d.getTime() - startedAt) / 60_000).toFixed(1)} min` : '—')
  console.log(
    `[demo-pace] ${label} at ${SPEED}×: ${incidents.length} incidents, ${mails.length} mails\n` +
      incidents.map((i) => `  ${i.tank}: ${i.title} (${i.state}) opened ${minute(i.opened_at)}, resolved ${minute(i.resolved_at)}`).join('\n') +
      `\n  mails: ${mails.map((m) => m.kind).join(', ')}`,
  )
  return { incidents, mails }
}
