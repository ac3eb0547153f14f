import { connect as tcpConnect, type Socket } from 'node:net'
import mqtt from 'mqtt'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_PAYLOAD_BYTES, outcomesTopic, readingsTopic, type MessageOutcome } from '@shared/ingest/contract'
import { CONNECT_TIMEOUT_MS } from '../../server/mqtt/broker'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
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

/** A variable byte integer as MQTT writes a packet's remaining length. */
function remainingLength(n: number) {
  const bytes: number[] = []
  do {
    let byte = n % 128
    n = Math.floor(n / 128)
    if (n > 0) byte |= 0x80
    bytes.push(byte)
  } while (n > 0)
  return Buffer.from(bytes)
}

type RawSocket = { socket: Socket; closedAt: Promise<number>; written: () => number }

async function rawSocket(): Promise<RawSocket> {
  const socket = tcpConnect(s.mqttPort!, '127.0.0.1')
  socket.on('error', () => {})
  await new Promise((resolve) => socket.once('connect', resolve))
  let written = 0
  const write = socket.write.bind(socket)
  socket.write = ((chunk: Buffer, ...rest: never[]) => {
    written += chunk.length
    return write(chunk, ...rest)
  }) as typeof socket.write
  return { socket, closedAt: new Promise((resolve) => socket.once('close', () => resolve(Date.now()))), written: () => written }
}

/** Streams zero bytes until the server closes the socket or `total` bytes are sent. */
async function stream(raw: RawSocket, total: number) {
  const chunk = Buffer.alloc(64 * 1024)
  while (raw.written() < total && !raw.socket.destroyed) {
    if (!raw.socket.write(chunk)) await Promise.race([new Promise((r) => raw.socket.once('drain', r)), raw.closedAt])
  }
}

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
    const id = Buffer.from(String(node.deviceId))
    const token = Buffer.from(node.token)
    const clientId = Buffer.from('raw-device')
    const field = (b: Buffer) => Buffer.concat([Buffer.from([b.length >> 8, b.length & 0xff]), b])
    // CONNECT, MQTT 3.1.1, user name and password flags, keepalive 60 s.
    const variable = Buffer.concat([field(Buffer.from('MQTT')), Buffer.from([4, 0xc2, 0, 60]), field(clientId), field(id), field(token)])
    raw.socket.write(Buffer.concat([Buffer.from([0x10]), remainingLength(variable.length), variable]))
    const connack = await new Promise<Buffer>((resolve) => raw.socket.once('data', resolve))
    expect([...connack.subarray(0, 4)]).toEqual([0x20, 2, 0, 0])
    const topic = field(Buffer.from(readingsTopic(node.deviceId)))
    raw.socket.write(Buffer.concat([Buffer.from([0x30]), remainingLength(topic.length + 20_000_000), topic]))
    await within(stream(raw, 8 * 1024 * 1024), 10_000)
    expect(await within(raw.closedAt, 3000)).not.toBe('timeout')
    expect(raw.written()).toBeLessThan(20_000_000)
    expect(await lastError(node.deviceId)).toMatch(/larger than 262144 bytes/)
  })
})
