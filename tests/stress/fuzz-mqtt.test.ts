import fc from 'fast-check'
import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_PAYLOAD_BYTES, MAX_READINGS_PER_MESSAGE, readingsTopic } from '@shared/ingest/contract'
import { METRIC_KEYS } from '@shared/metrics'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { hostileBody } from '../helpers/fuzz-values'
import { startTestServer } from '../helpers/server'

// Hostile readings payloads over a real MQTT connection to the embedded broker: the broker keeps the
// connection and the process, an unreadable envelope stores nothing, and nothing implausible is stored.
// A payload over MAX_PAYLOAD_BYTES is refused by closing its connection (tests/mqtt/hostile-packets).
const NUM_RUNS = Number(process.env.FUZZ_RUNS ?? 100)
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
const unexpected: unknown[] = []
const onUnexpected = (error: unknown) => unexpected.push(error)

beforeAll(async () => {
  process.on('unhandledRejection', onUnexpected)
  process.on('uncaughtException', onUnexpected)
  s = await startTestServer()
  org = await s.createOrg('Marrowfen MQTT Fuzz')
  node = await createTankWithDevice(s.ctx, org, 'Fuzz MQTT tank')
})
afterAll(async () => {
  process.off('unhandledRejection', onUnexpected)
  process.off('uncaughtException', onUnexpected)
  await s?.close()
})

const connect = (username: string, password: string) =>
  mqtt.connectAsync(s.mqttUrl, { username, password, reconnectPeriod: 0, connectTimeout: 5000, clientId: `fuzz-${Math.random()}` })

const rowsOf = (tankId: number) =>
  s.ctx.sequelize.query<{ metric: string; value: number; time: Date }>('SELECT metric, value, time FROM readings WHERE tank_id = $1', {
    bind: [tankId],
    type: QueryTypes.SELECT,
  })

/** What the contract says about an envelope, judged independently of the server's code. */
function envelopeReadable(payload: string): { ok: false } | { ok: true; readings: number } {
  let body: unknown
  try {
    body = JSON.parse(payload)
  } catch {
    return { ok: false }
  }
  if (!body || typeof body !== 'object' || Array.isArray(body)) return { ok: false }
  const { v, readings } = body as { v?: unknown; readings?: unknown }
  if (v !== 1 || !Array.isArray(readings) || readings.length < 1 || readings.length > MAX_READINGS_PER_MESSAGE) return { ok: false }
  return { ok: true, readings: readings.length }
}

const basePayload = fc.integer({ min: 2, max: 3000 }).map((minutesAgo) => {
  const time = new Date(Date.now() - minutesAgo * 60_000).toISOString()
  return {
    v: 1,
    readings: [
      { metric: 'temperature', value: 25.1, unit: 'C', time },
      { metric: 'ph', value: 7, time },
    ],
  }
})

describe('hostile readings payloads over MQTT', () => {
  it('keeps the connection, stores nothing from an unreadable envelope and nothing implausible', async () => {
    const client = await connect(String(node.deviceId), node.token)
    let closed = false
    client.on('close', () => (closed = true))
    const failures: string[] = []
    let cases = 0
    const payloads = fc.oneof(
      { weight: 9, arbitrary: basePayload.chain((base) => hostileBody(base)).map((b) => ({ bytes: Buffer.from(b.json ?? '', 'utf8'), how: b.how })) },
      { weight: 1, arbitrary: fc.uint8Array({ maxLength: 2000 }).map((a) => ({ bytes: Buffer.from(a), how: 'raw bytes' })) },
    )
    await fc.assert(
      fc.asyncProperty(payloads, async ({ bytes, how }) => {
        cases++
        const before = (await rowsOf(node.tankId)).length
        if (bytes.length > MAX_PAYLOAD_BYTES) {
          const oversize = await connect(String(node.deviceId), node.token)
          const cut = new Promise<'closed'>((resolve) => oversize.once('close', () => resolve('closed')))
          oversize.publish(readingsTopic(node.deviceId), bytes, { qos: 1 }, () => {})
          if ((await Promise.race([cut, new Promise<'open'>((r) => setTimeout(() => r('open'), 5000))])) === 'open')
            failures.push(`[${how}] ${bytes.length} bytes: connection kept`)
          oversize.end(true)
          if ((await rowsOf(node.tankId)).length !== before) failures.push(`[${how}] ${bytes.length} bytes: rows stored`)
          return
        }
        try {
          await client.publishAsync(readingsTopic(node.deviceId), bytes, { qos: 1 })
        } catch (error) {
          failures.push(`[${how}] publish failed: ${(error as Error).message}`)
          return
        }
        // PUBACK came back, so whatever was accepted is committed.
        const rows = await rowsOf(node.tankId)
        const stored = rows.length - before
        const envelope = envelopeReadable(bytes.toString('utf8'))
        if (!envelope.ok && stored !== 0) failures.push(`[${how}] unreadable envelope stored ${stored} rows: ${bytes.toString('utf8').slice(0, 200)}`)
        if (envelope.ok && stored > envelope.readings) failures.push(`[${how}] stored ${stored} rows from ${envelope.readings} readings`)
        if (closed) failures.push(`[${how}] the broker closed the connection`)
      }),
      { numRuns: NUM_RUNS, seed: SEED },
    )
    const rows = await rowsOf(node.tankId)
    const implausible = rows.filter((r) => !METRIC_KEYS.includes(r.metric as never) || !Number.isFinite(r.value) || r.time.getTime() > Date.now() + 5 * 60_000)
    await s.ctx.readings.status.flush()
    const device = await s.ctx.models.Device.findByPk(node.deviceId)
    console.log(
      `fuzz MQTT readings payload: ${cases} cases, ${failures.length} failures, ${rows.length} rows stored, ${device!.rejectedCount} rejections recorded, ${unexpected.length} unhandled errors`,
    )
    expect(failures.slice(0, 10)).toEqual([])
    expect(implausible).toEqual([])
    expect(Number(device!.rejectedCount)).toBeGreaterThan(0)
    expect(unexpected).toEqual([])
    await client.endAsync()
  })

  it('cuts a publish to any topic but its own and stores nothing, and the broker keeps serving', async () => {
    const other = await createTankWithDevice(s.ctx, org, 'Fuzz neighbour tank')
    const topics = fc.oneof(
      fc.constantFrom(
        readingsTopic(other.deviceId),
        `tankwarden/v1/devices/${node.deviceId}/commands`,
        `tankwarden/v1/devices/${node.deviceId}/readings/x`,
        `tankwarden/v1/devices/0${node.deviceId}/readings`,
        `tankwarden/v1/devices/${node.deviceId}`,
        'tankwarden/v1/devices/+/readings',
        `TANKWARDEN/v1/devices/${node.deviceId}/readings`,
        `tankwarden/v1/devices/${node.deviceId}/readings\u0000`,
        '$SYS/broker',
        '',
      ),
      fc.string({ minLength: 1, maxLength: 60 }).filter((t) => t !== readingsTopic(node.deviceId)),
    )
    let cases = 0
    const failures: string[] = []
    const payload = JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7, time: new Date().toISOString() }] })
    await fc.assert(
      fc.asyncProperty(topics, async (topic) => {
        cases++
        const client = await connect(String(node.deviceId), node.token)
        const before = (await rowsOf(other.tankId)).length + (await rowsOf(node.tankId)).length
        const closed = new Promise<'closed'>((resolve) => client.once('close', () => resolve('closed')))
        client.on('error', () => {}) // an invalid topic is refused by MQTT.js itself; both outcomes are fine
        client.publish(topic, payload, { qos: 1 }, () => {})
        const outcome = await Promise.race([closed, new Promise<'open'>((r) => setTimeout(() => r('open'), 3000))])
        const after = (await rowsOf(other.tankId)).length + (await rowsOf(node.tankId)).length
        if (after !== before) failures.push(`${JSON.stringify(topic)}: stored ${after - before} rows`)
        // MQTT.js refuses wildcard and empty topics before sending; everything it does send must cut the connection.
        const clientRefuses = topic === '' || /[+#]/.test(topic) || topic.includes('\u0000')
        if (outcome === 'open' && !clientRefuses) failures.push(`${JSON.stringify(topic)}: connection kept`)
        client.end(true)
      }),
      { numRuns: Math.min(NUM_RUNS, 40), seed: SEED },
    )
    console.log(`fuzz MQTT topics: ${cases} cases, ${failures.length} failures`)
    expect(failures).toEqual([])
    // Still serving: a good reading on the own topic is stored.
    const client = await connect(String(node.deviceId), node.token)
    const time = new Date(Date.now() - 30_000).toISOString()
    await client.publishAsync(readingsTopic(node.deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 6.8, time }] }), { qos: 1 })
    expect((await rowsOf(node.tankId)).some((r) => r.time.toISOString() === time && r.value === 6.8)).toBe(true)
    await client.endAsync()
    expect((await fetch(`${s.baseUrl}/api/v1/health`)).status).toBe(200)
  })
})
