import mqtt, { type MqttClient } from 'mqtt'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { outcomesTopic, readingsTopic, type MessageOutcome } from '@shared/ingest/contract'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { until } from '../helpers/wait'

// The outcomes topic: what a device hears about each message it sent. Rejection reasons as such are
// in tests/mqtt/ingest.test.ts (recorded on the device) and tests/api/readings-http.test.ts.

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>
let other: Awaited<ReturnType<typeof createTankWithDevice>>
let client: MqttClient
const outcomes: MessageOutcome[] = []

beforeAll(async () => {
  s = await startTestServer()
  org = await s.createOrg('Marrowfen Outcomes')
  node = await createTankWithDevice(s.ctx, org, 'Outcome tank')
  other = await createTankWithDevice(s.ctx, org, 'Other outcome tank')
  client = await mqtt.connectAsync(s.mqttUrl, { username: String(node.deviceId), password: node.token, reconnectPeriod: 0, clientId: 'outcome-node' })
  client.on('message', (_topic, payload) => outcomes.push(JSON.parse(payload.toString())))
  await client.subscribeAsync(outcomesTopic(node.deviceId), { qos: 0 })
})
afterAll(async () => {
  await client?.endAsync()
  await s.close()
})

/** Publishes one message at QoS 1 and answers its outcome with the packet id it went out under. */
async function send(payload: string) {
  const seen = outcomes.length
  const packet = await client.publishAsync(readingsTopic(node.deviceId), payload, { qos: 1 })
  await until(() => outcomes.length > seen, 2000, 20)
  expect(outcomes.length).toBe(seen + 1)
  return { outcome: outcomes[seen], messageId: packet?.messageId }
}

const at = (msAgo: number) => new Date(Date.now() - msAgo).toISOString()

describe('the device outcomes topic', () => {
  it('tells a stored message, then the same message again as a duplicate, by packet id', async () => {
    const body = JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7.1, time: at(60_000) }] })
    const first = await send(body)
    expect(first.outcome).toEqual({ v: 1, messageId: first.messageId, outcome: 'stored', accepted: 1, duplicates: 0, rejected: 0, results: [] })
    const again = await send(body)
    expect(again.messageId).not.toBe(first.messageId)
    expect(again.outcome).toEqual({
      v: 1,
      messageId: again.messageId,
      outcome: 'duplicate',
      accepted: 0,
      duplicates: 1,
      rejected: 0,
      results: [{ index: 0, outcome: 'duplicate' }],
    })
  })

  it('names the reason and the field of each rejected reading; one good reading makes the message stored', async () => {
    const { outcome } = await send(
      JSON.stringify({
        v: 1,
        readings: [
          { metric: 'temperature', value: 25.5, time: at(50_000) },
          { metric: 'temperature', value: 95, time: at(50_000) },
          { metric: 'ph', value: 7, unit: 'furlongs', time: at(50_000) },
          { metric: 'salinity_x', value: 1, time: at(50_000) },
          { metric: 'ph', value: 7, time: at(-3600_000) },
        ],
      }),
    )
    expect(outcome).toMatchObject({ outcome: 'stored', accepted: 1, duplicates: 0, rejected: 4 })
    expect(outcome.results.map((r) => [r.index, r.outcome, 'field' in r ? r.field : null])).toEqual([
      [1, 'rejected', 'readings.1.value'],
      [2, 'rejected', 'readings.2.unit'],
      [3, 'rejected', 'readings.3.metric'],
      [4, 'rejected', 'readings.4.time'],
    ])
    expect(outcome.results[0]).toMatchObject({ reason: expect.stringMatching(/implausible temperature 95/) })
  })

  it('refuses a message with only bad readings, with their reasons', async () => {
    const { outcome } = await send(JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 'seven', time: at(40_000) }] }))
    expect(outcome).toMatchObject({ outcome: 'refused', accepted: 0, rejected: 1, results: [{ index: 0, outcome: 'rejected', field: 'readings.0.value' }] })
  })

  it('refuses a message that is not JSON, or not the envelope, naming where', async () => {
    expect((await send('{not json')).outcome).toMatchObject({ outcome: 'refused', field: 'body', reason: 'payload is not valid JSON', results: [] })
    const wrong = await send(JSON.stringify({ v: 2, readings: [] }))
    expect(wrong.outcome).toMatchObject({ outcome: 'refused', field: 'v', reason: expect.stringMatching(/^v: /) })
  })

  it('tells a QoS 0 message without a packet id', async () => {
    const seen = outcomes.length
    client.publish(readingsTopic(node.deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7.3, time: at(30_000) }] }), { qos: 0 })
    await until(() => outcomes.length > seen, 2000, 20)
    expect(outcomes[seen]).toMatchObject({ messageId: null, outcome: 'stored', accepted: 1 })
  })

  it("lets no device subscribe to another device's outcomes", async () => {
    await expect(client.subscribeAsync(outcomesTopic(other.deviceId), { qos: 0 })).rejects.toThrow(/Subscribe error/)
    await expect(client.subscribeAsync('tankwarden/v1/devices/+/outcomes', { qos: 0 })).rejects.toThrow(/Subscribe error/)
  })
})
