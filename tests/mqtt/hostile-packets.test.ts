import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_PAYLOAD_BYTES, outcomesTopic, readingsTopic, type MessageOutcome } from '@shared/ingest/contract'
import { CONNECT_TIMEOUT_MS, QUEUED_BEFORE_CONNECTED } from '../../server/mqtt/broker'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { connectPacket, publishHeader, rawSocket as openRaw, remainingLength, streamZeros as stream } from '../helpers/mqtt-raw'
import { startTestServer } from '../helpers/server'

// Packet and message sizes on the embedded broker, over raw TCP where a real client would refuse to
// send such bytes. Topic rules and malformed JSON are in tests/mqtt/ingest.test.ts, hostile payloads
// within the limits in tests/stress/fuzz-mqtt.test.ts.

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Marrowfen Hostile Packets')
  node = await createTankWithDevice(s.ctx, org, 'Packet tank')
})
afterAll(() => s.close())

const rawSocket = () => openRaw(s.mqttPort!)
const within = <T>(p: Promise<T>, ms: number) => Promise.race([p, new Promise<'timeout'>((r) => setTimeout(() => r('timeout'), ms))])

async function lastError(deviceId: number) {
  await s.ctx.readings.status.flush()
  return (await s.ctx.models.Device.findByPk(deviceId))!.lastError
}

async function storedCount(tankId: number) {
  const [row] = await s.ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
    bind: [tankId],
    type: QueryTypes.SELECT,
  })
  return row.n
}

describe('packets before sign-in', () => {
  it('closes a connection whose first packet is an 80 MiB PUBLISH, before its body is read', async () => {
    const raw = await rawSocket()
    raw.socket.write(Buffer.concat([Buffer.from([0x30]), remainingLength(80 * 1024 * 1024)]))
    const started = Date.now()
    await within(stream(raw, 8 * 1024 * 1024), 10_000)
    const closed = await within(raw.closedAt, 3000)
    expect(closed).not.toBe('timeout')
    expect((closed as number) - started).toBeLessThan(3000)
    expect(s.broker!.stats().refusedPackets).toBeGreaterThan(0)
  })

  it('closes a connection announcing a CONNECT larger than 16 KiB', async () => {
    const raw = await rawSocket()
    // Protocol name, level 4, a will flag, keepalive 60 s: then a will that never ends.
    const variable = Buffer.from([0, 4, ...Buffer.from('MQTT'), 4, 0x06, 0, 60])
    raw.socket.write(Buffer.concat([Buffer.from([0x10]), remainingLength(1024 * 1024), variable]))
    await within(stream(raw, 2 * 1024 * 1024), 10_000)
    expect(await within(raw.closedAt, 3000)).not.toBe('timeout')
  })

  it(`closes a connection that sends more than ${QUEUED_BEFORE_CONNECTED} packets before its CONNECT is checked, storing none of them`, async () => {
    const before = await storedCount(node.tankId)
    const message = (i: number) =>
      JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value: 25, time: new Date(Date.now() - i * 1000).toISOString() }] })
    const publishes = Array.from({ length: 20 }, (_, i) =>
      Buffer.concat([publishHeader(readingsTopic(node.deviceId), Buffer.byteLength(message(i))), Buffer.from(message(i))]),
    )
    const raw = await rawSocket()
    // One write: the broker reads all of it while the device's token is still being looked up.
    raw.socket.write(Buffer.concat([connectPacket(String(node.deviceId), node.token, 'eager-device'), ...publishes]))
    expect(await within(raw.closedAt, 3000)).not.toBe('timeout')
    await s.ctx.readings.writer.drain()
    expect(await storedCount(node.tankId)).toBe(before)
  })

  it(`closes a connection that sends no CONNECT within ${CONNECT_TIMEOUT_MS / 1000} s`, async () => {
    const raw = await rawSocket()
    const started = Date.now()
    const closed = await within(raw.closedAt, CONNECT_TIMEOUT_MS + 3000)
    expect(closed).not.toBe('timeout')
    expect((closed as number) - started).toBeGreaterThanOrEqual(CONNECT_TIMEOUT_MS - 500)
  })
})

describe(`messages over ${MAX_PAYLOAD_BYTES} bytes`, () => {
  const connect = () =>
    mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0, clientId: `hostile-${Math.random()}` })

  /** A valid readings message padded with whitespace to `bytes`. */
  function validMessage(bytes: number) {
    const body = JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7.2, time: new Date(Date.now() - 5000).toISOString() }] })
    return body + ' '.repeat(bytes - body.length)
  }

  it('refuses a valid 300 KB message: nothing stored, the device told why, the connection closed', async () => {
    const before = await storedCount(node.tankId)
    const client = await connect()
    await client.subscribeAsync(outcomesTopic(node.deviceId), { qos: 0 })
    const outcome = new Promise<MessageOutcome>((resolve) => client.once('message', (_t, m) => resolve(JSON.parse(m.toString()))))
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    client.publish(readingsTopic(node.deviceId), validMessage(300_000), { qos: 1 })
    expect(await within(closed, 5000)).not.toBe('timeout')
    expect(await within(outcome, 2000)).toMatchObject({ outcome: 'refused', field: 'body', reason: expect.stringMatching(/larger than 262144 bytes/) })
    client.end(true)
    expect(await storedCount(node.tankId)).toBe(before)
    expect(await lastError(node.deviceId)).toMatch(/larger than 262144 bytes/)
  })

  it('refuses a message just over the limit, which passes the header check, the same way', async () => {
    const before = await storedCount(node.tankId)
    const client = await connect()
    const closed = new Promise<void>((resolve) => client.once('close', () => resolve()))
    client.publish(readingsTopic(node.deviceId), validMessage(MAX_PAYLOAD_BYTES + 1), { qos: 1 })
    expect(await within(closed, 5000)).not.toBe('timeout')
    client.end(true)
    expect(await storedCount(node.tankId)).toBe(before)
  })

  it('stores a message of exactly the limit', async () => {
    const before = await storedCount(node.tankId)
    const client = await connect()
    await client.publishAsync(readingsTopic(node.deviceId), validMessage(MAX_PAYLOAD_BYTES), { qos: 1 })
    await client.endAsync()
    expect(await storedCount(node.tankId)).toBe(before + 1)
  })

  it('closes a signed-in device sending a 20 MB message before the message is read', async () => {
    const raw = await rawSocket()
    raw.socket.write(connectPacket(String(node.deviceId), node.token, 'raw-device'))
    const connack = await new Promise<Buffer>((resolve) => raw.socket.once('data', resolve))
    expect([...connack.subarray(0, 4)]).toEqual([0x20, 2, 0, 0])
    raw.socket.write(publishHeader(readingsTopic(node.deviceId), 20_000_000))
    await within(stream(raw, 8 * 1024 * 1024), 10_000)
    expect(await within(raw.closedAt, 3000)).not.toBe('timeout')
    expect(raw.written()).toBeLessThan(20_000_000)
    expect(await lastError(node.deviceId)).toMatch(/larger than 262144 bytes/)
  })
})
