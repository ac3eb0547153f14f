// Device side of the MQTT contract: username = device id, password = token, QoS 1 to its readings topic.
import mqtt, { type MqttClient } from 'mqtt'
import { outcomesTopic, readingsTopic, type MessageOutcome } from '@shared/ingest/contract'
import { readingsBody, type SendOutcome, type Transport, type TransportOptions } from './types'

export interface MqttTransportOptions extends TransportOptions {
  /** Gap between reconnect attempts, ms. */
  reconnectPeriodMs?: number
  /** How long the first connection may take (broker still starting), ms. */
  connectDeadlineMs?: number
  /** Wait for a PUBACK at most this long before reporting the message as queued, ms. */
  ackTimeoutMs?: number
  /** `rejected`: the broker's outcome for a message: refused, or some of its readings rejected. */
  onEvent?: (event: 'reconnect' | 'offline' | 'connect' | 'refused' | 'rejected', detail?: string) => void
}

/** One line for an outcome worth reporting (something not stored), or null. */
export function describeOutcome(outcome: MessageOutcome): string | null {
  const id = outcome.messageId === null ? 'a QoS 0 message' : `message ${outcome.messageId}`
  if (outcome.reason) return `${id} refused: ${outcome.reason} (${outcome.field})`
  if (!outcome.rejected) return null
  const first = outcome.results.find((r) => r.outcome === 'rejected')
  const detail = first && first.outcome === 'rejected' ? `; first: ${first.field ?? `reading ${first.index}`}: ${first.reason}` : ''
  return `${id}: ${outcome.rejected} of ${outcome.accepted + outcome.duplicates + outcome.rejected} readings rejected${detail}`
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms))

/** CONNACK refusals (bad credentials, revoked device) carry a numeric reason code; socket errors a string. */
const isRefusal = (err: unknown) => typeof (err as { code?: unknown }).code === 'number'

async function connectWithRetry(options: MqttTransportOptions): Promise<MqttClient> {
  const reconnectPeriod = options.reconnectPeriodMs ?? 2000
  const deadline = Date.now() + (options.connectDeadlineMs ?? 120_000)
  const clientId = `tw-sim-${options.deviceId}-${Math.random().toString(36).slice(2, 8)}`
  for (;;) {
    try {
      return await mqtt.connectAsync(options.url, {
        clientId,
        username: String(options.deviceId),
        password: options.token,
        reconnectPeriod,
        connectTimeout: 10_000,
      })
    } catch (err) {
      if (isRefusal(err) || Date.now() > deadline) throw err
      await sleep(reconnectPeriod)
    }
  }
}

export async function createMqttTransport(options: MqttTransportOptions): Promise<Transport> {
  const client = await connectWithRetry(options)
  const topic = readingsTopic(options.deviceId)
  const ackTimeoutMs = options.ackTimeoutMs ?? 5000
  let refusal: string | null = null

  client.on('error', (err) => {
    if (isRefusal(err)) {
      refusal = err.message
      options.onEvent?.('refused', err.message)
    }
  })
  // The broker says what became of each message here; MQTT.js subscribes again after a reconnect.
  client.on('message', (_topic, payload) => {
    let outcome: MessageOutcome
    try {
      outcome = JSON.parse(payload.toString('utf8')) as MessageOutcome
    } catch {
      return
    }
    const line = describeOutcome(outcome)
    if (line) options.onEvent?.('rejected', line)
  })
  await client.subscribeAsync(outcomesTopic(options.deviceId), { qos: 0 })
  client.on('reconnect', () => options.onEvent?.('reconnect'))
  client.on('offline', () => options.onEvent?.('offline'))
  client.on('connect', () => {
    refusal = null
    options.onEvent?.('connect')
  })

  async function publish(body: string): Promise<SendOutcome> {
    if (refusal) return { delivered: false, error: refusal }
    const acked = client.publishAsync(topic, body, { qos: 1 })
    if (!client.connected) {
      // mqtt.js keeps QoS 1 messages in its outgoing store and sends them after reconnecting.
      acked.catch(() => {})
      return { delivered: false, queued: true }
    }
    let timer: NodeJS.Timeout | undefined
    const timeout = new Promise<SendOutcome>((resolve) => {
      timer = setTimeout(() => resolve({ delivered: false, queued: true }), ackTimeoutMs)
    })
    try {
      return await Promise.race([acked.then((): SendOutcome => ({ delivered: true })), timeout])
    } catch (err) {
      return { delivered: false, error: (err as Error).message }
    } finally {
      clearTimeout(timer)
    }
  }

  return {
    kind: 'mqtt',
    send: (readings) => publish(readingsBody(readings)),
    sendRaw: publish,
    // Offline, a graceful end would wait for acks that cannot come.
    close: () => client.endAsync(!client.connected),
  }
}
