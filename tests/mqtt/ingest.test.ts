import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { commandsTopic, readingsTopic } from '@shared/ingest/contract'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let other: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('MQTT Org')
  node = await createTankWithDevice(s.ctx, org, 'MQTT tank')
  other = await createTankWithDevice(s.ctx, org, 'Other tank')
})
afterAll(() => s.close())

const connect = (username: string, password: string) =>
  mqtt.connectAsync(s.mqttUrl, { username, password, reconnectPeriod: 0, connectTimeout: 5000, clientId: `t-${Math.random()}` })

async function rowsFor(tankId: number) {
  return s.ctx.sequelize.query<{ metric: string; value: number; time: Date; source: string }>(
    'SELECT metric, value, time, source FROM readings WHERE tank_id = $1 ORDER BY time, metric',
    { bind: [tankId], type: QueryTypes.SELECT },
  )
}

describe('MQTT ingest over real TCP', () => {
  it('stores a QoS 1 batch, converted to canonical units, before the acknowledgement', async () => {
    const client = await connect(String(node.deviceId), node.token)
    const time = new Date(Date.now() - 60_000).toISOString()
    await client.publishAsync(
      readingsTopic(node.deviceId),
      JSON.stringify({
        v: 1,
        readings: [
          { metric: 'temperature', value: 78.8, unit: 'F', time },
          { metric: 'water_level', value: 412, unit: 'mm', time },
          { metric: 'ph', value: 7.1, time },
        ],
      }),
      { qos: 1 },
    )
    // PUBACK came back, so the rows are committed already.
    const rows = await rowsFor(node.tankId)
    expect(rows.map((r) => r.metric)).toEqual(['ph', 'temperature', 'water_level'])
    expect(rows.find((r) => r.metric === 'temperature')!.value).toBeCloseTo(26, 6) // (78.8 − 32) × 5/9
    expect(rows.find((r) => r.metric === 'water_level')!.value).toBeCloseTo(41.2, 6)
    expect(rows.every((r) => r.source === 'device')).toBe(true)
    await client.endAsync()
  })

  it('stores a retried batch once', async () => {
    const client = await connect(String(node.deviceId), node.token)
    const time = new Date(Date.now() - 30_000).toISOString()
    const payload = JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 6.9, time }] })
    await client.publishAsync(readingsTopic(node.deviceId), payload, { qos: 1 })
    await client.publishAsync(readingsTopic(node.deviceId), payload, { qos: 1 })
    const rows = (await rowsFor(node.tankId)).filter((r) => r.time.toISOString() === time)
    expect(rows).toHaveLength(1)
    await client.endAsync()
  })

  it('refuses a wrong token at CONNECT', async () => {
    await expect(connect(String(node.deviceId), `twd_${node.deviceId}_${'x'.repeat(43)}`)).rejects.toThrow(/Bad username or password|Not authorized/i)
    await expect(connect(String(other.deviceId), node.token)).rejects.toThrow(/Bad username or password/i)
  })

  it('cuts the connection when a device publishes to another device topic', async () => {
    const client = await connect(String(node.deviceId), node.token)
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    client.publish(readingsTopic(other.deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7, time: new Date().toISOString() }] }), { qos: 1 })
    await closed
    expect(await rowsFor(other.tankId)).toHaveLength(0)
    client.end(true)
  })

  it('grants only the own commands topic on subscribe', async () => {
    const client = await connect(String(node.deviceId), node.token)
    const own = await client.subscribeAsync(commandsTopic(node.deviceId), { qos: 1 })
    expect(own[0].qos).toBe(1)
    // The broker answers SUBACK 0x80 (failure); MQTT.js turns that into an error.
    await expect(client.subscribeAsync(readingsTopic(other.deviceId), { qos: 1 })).rejects.toThrow(/Subscribe error/)
    await expect(client.subscribeAsync('tankwarden/v1/devices/+/readings', { qos: 1 })).rejects.toThrow(/Subscribe error/)
    await client.endAsync()
  })

  it('records rejections on the device: malformed JSON, unknown metric, implausible value, future time', async () => {
    const client = await connect(String(node.deviceId), node.token)
    await client.publishAsync(readingsTopic(node.deviceId), '{not json', { qos: 1 })
    const now = Date.now()
    await client.publishAsync(
      readingsTopic(node.deviceId),
      JSON.stringify({
        v: 1,
        readings: [
          { metric: 'salinity_x', value: 1, time: new Date(now).toISOString() },
          { metric: 'temperature', value: 95, time: new Date(now).toISOString() },
          { metric: 'ph', value: 7, time: new Date(now + 3600_000).toISOString() },
        ],
      }),
      { qos: 1 },
    )
    await s.ctx.readings.status.flush()
    const device = await s.ctx.models.Device.findByPk(node.deviceId)
    expect(Number(device!.rejectedCount)).toBe(4)
    expect(device!.lastError).toMatch(/unknown metric "salinity_x"/)
    expect(device!.lastSeenAt).not.toBeNull()
    await client.endAsync()
  })

  it('cuts a live connection when the device is revoked', async () => {
    const fresh = await createTankWithDevice(s.ctx, org, 'Revoked tank')
    const client = await connect(String(fresh.deviceId), fresh.token)
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    await s.ctx.models.Device.update({ revokedAt: new Date() }, { where: { id: fresh.deviceId } })
    s.ctx.events.emit('device.revoked', { deviceId: fresh.deviceId })
    await closed
    client.end(true)
    await expect(connect(String(fresh.deviceId), fresh.token)).rejects.toThrow(/Bad username or password/i)
  })
})
