import mqtt from 'mqtt'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readingsTopic } from '@shared/ingest/contract'
import { bearer } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { sleep } from '../helpers/wait'

// Fault: devices with clocks ahead of the server, and readings that arrive out of time order
// (a device catching up on a backlog, two paths with different delays).

const MIN = 60_000
const MAX_FUTURE_SECONDS = 120
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg

beforeAll(async () => {
  s = await startTestServer({ readingLimits: { maxFutureSeconds: MAX_FUTURE_SECONDS, maxAgeDays: 400 } })
  org = await s.createOrg('Marrowfen Aquatics clocks')
  for (let i = 0; i < 100 && !s.rules.lock.isLeader; i++) await sleep(50)
})
afterAll(() => s.close())

type Reading = { metric: string; value: number; time: string }
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer, typed loosely like supertest's res.body: each test reads the fields it checks
async function api(path: string, token: string, init: RequestInit = {}): Promise<{ status: number; body: any }> {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  return { status: res.status, body: await res.json() }
}
const postReadings = (token: string, readings: Reading[]) => api('/readings', token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })
const temperature = (at: number, value: number): Reading => ({ metric: 'temperature', value, time: new Date(at).toISOString() })

async function withHeatRule(name: string) {
  const node = await createTankWithDevice(s.ctx, org, name)
  await s.ctx.models.WatchRule.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0],
    tankId: node.tankId,
    name: 'Temperature above 28 °C for 10 min',
    severity: 'alarm',
    spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
  })
  s.ctx.events.emit('rules.changed', { tankIds: [node.tankId] })
  await s.rules.engine.settle()
  return node
}
const incidentsOf = (tankId: number) => s.ctx.models.Incident.findAll({ where: { tankId }, order: [['id', 'ASC']] })

describe('a device clock running ahead', () => {
  it('rejects readings beyond MAX_FUTURE_SECONDS with the reason, counts them on the device, and accepts those within', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Skewed clock tank')
    const now = Date.now()
    const res = await postReadings(node.token, [
      temperature(now + (MAX_FUTURE_SECONDS + 60) * 1000, 25.1),
      temperature(now + (MAX_FUTURE_SECONDS - 30) * 1000, 25.2),
      { metric: 'ph', value: 7.2, time: new Date(now + 3600_000).toISOString() },
    ])
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ accepted: 1, duplicates: 0, rejected: 2 })
    expect(res.body.results[0]).toEqual({
      index: 0,
      outcome: 'rejected',
      field: 'readings.0.time',
      reason: expect.stringMatching(new RegExp(`more than ${MAX_FUTURE_SECONDS} s in the future \\(check the device clock\\)`)),
    })
    expect(res.body.results[1]).toEqual({ index: 1, outcome: 'accepted' })
    expect(res.body.results[2].outcome).toBe('rejected')

    // The same over MQTT, where the device hears nothing back: the count on the device tells.
    const client = await mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0 })
    await client.publishAsync(
      readingsTopic(node.deviceId),
      JSON.stringify({ v: 1, readings: [temperature(Date.now() + 10 * MIN, 25.3), temperature(Date.now() - MIN, 25.4)] }),
      { qos: 1 },
    )
    await client.endAsync()

    await s.ctx.readings.status.flush()
    const device = await api(`/devices/${node.deviceId}`, org.users.owner.token)
    expect(device.status).toBe(200)
    expect(device.body.rejectedCount).toBe(3)
    expect(device.body.lastError).toMatch(/in the future \(check the device clock\)/)

    const series = await api(
      `/tanks/${node.tankId}/series?metric=temperature&from=${new Date(now - 2 * MIN).toISOString()}&to=${new Date(now + 3600_000).toISOString()}`,
      org.users.viewer.token,
    )
    expect(series.body.raw.map((p: { value: number }) => p.value)).toEqual([25.4, 25.2])
  })
})

describe('out-of-order readings', () => {
  it('stores a shuffled backlog and serves the series in time order', async () => {
    const node = await createTankWithDevice(s.ctx, org, 'Backlog tank')
    const t0 = Date.now() - 60 * MIN
    const values = Array.from({ length: 30 }, (_, i) => ({ at: t0 + i * MIN, value: 24 + i / 10 }))
    const order = [17, 3, 29, 0, 11, 25, 8, 21, 14, 5, 27, 1, 19, 10, 23, 6, 28, 13, 2, 16, 24, 9, 20, 4, 26, 12, 18, 7, 22, 15]
    // One reading per request, in a scrambled order; then the whole backlog again (a device resending it).
    for (const i of order) expect((await postReadings(node.token, [temperature(values[i].at, values[i].value)])).body.accepted).toBe(1)
    const again = await postReadings(
      node.token,
      order.map((i) => temperature(values[i].at, values[i].value)),
    )
    expect(again.body).toMatchObject({ accepted: 0, duplicates: 30, rejected: 0 })
    const series = await api(`/tanks/${node.tankId}/series?metric=temperature&from=${new Date(t0 - MIN).toISOString()}`, org.users.viewer.token)
    expect(series.body.raw.map((p: { t: string; value: number }) => [new Date(p.t).getTime(), p.value])).toEqual(values.map((v) => [v.at, v.value]))
  })

  it('evaluates a backlog sent in one message in time order, whatever order it is in', async () => {
    const node = await withHeatRule('Backlog heat tank')
    const t0 = Date.now() - 20 * MIN
    const shuffled = [7, 2, 12, 0, 9, 4, 11, 1, 6, 10, 3, 8, 5].map((i) => temperature(t0 + i * MIN, 28.6))
    expect((await postReadings(node.token, shuffled)).body.accepted).toBe(13)
    await s.rules.engine.settle()
    const incidents = await incidentsOf(node.tankId)
    expect(incidents).toHaveLength(1)
    expect(incidents[0].conditionSince.getTime()).toBe(t0)
    expect(incidents[0].openedAt.getTime()).toBe(t0 + 10 * MIN)
  })

  it('does not resolve an incident because of a late low reading, nor open one because of a late high reading', async () => {
    const node = await withHeatRule('Late reading tank')
    const t0 = Date.now() - 40 * MIN
    await postReadings(
      node.token,
      Array.from({ length: 12 }, (_, i) => temperature(t0 + i * MIN, 28.8)),
    )
    await s.rules.engine.settle()
    const [open] = await incidentsOf(node.tankId)
    expect(open.state).toBe('open')
    expect(open.openedAt.getTime()).toBe(t0 + 10 * MIN)

    // A reading from minute 4.5 turns up late, far below the clear margin: what is known now (11 min above) stands.
    expect((await postReadings(node.token, [temperature(t0 + 4.5 * MIN, 26.0)])).body.accepted).toBe(1)
    await s.rules.engine.settle()
    await s.rules.engine.tick()
    expect((await open.reload()).state).toBe('open')

    // The tank cools: the incident resolves at that reading.
    await postReadings(node.token, [temperature(t0 + 14 * MIN, 27.2)])
    await s.rules.engine.settle()
    expect((await open.reload()).state).toBe('resolved')
    expect(open.resolvedAt?.getTime()).toBe(t0 + 14 * MIN)

    // Late hot readings from before the cooling (a second path catching up) open nothing new.
    await postReadings(
      node.token,
      Array.from({ length: 2 }, (_, i) => temperature(t0 + (12 + i) * MIN + 30_000, 29.5)),
    )
    await s.rules.engine.settle()
    await s.rules.engine.tick(Date.now() + 15 * MIN)
    const after = await incidentsOf(node.tankId)
    expect(after.map((i) => [i.id, i.state])).toEqual([[open.id, 'resolved']])
  })
})
