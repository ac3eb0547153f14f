import mqtt, { type MqttClient } from 'mqtt'
import { QueryTypes, type Sequelize } from 'sequelize'
import { readingsTopic } from '@shared/ingest/contract'
import { sleep } from '../../helpers/wait'

/** Stored rows of one device and metric, keyed by time in ms, with how often each time is stored. */
export async function storedTimes(sequelize: Sequelize, deviceId: number, metric: string) {
  const rows = await sequelize.query<{ t: Date; n: number }>(
    'SELECT time AS t, count(*)::int AS n FROM readings WHERE source_key = $1 AND metric = $2 GROUP BY time',
    { bind: [`d:${deviceId}`, metric], type: QueryTypes.SELECT },
  )
  return new Map(rows.map((r) => [r.t.getTime(), r.n]))
}

export type Device = { deviceId: number; token: string }

/**
 * A device publishing one reading per QoS 1 message, as fast as `everyMs` allows, each with its own
 * time (`firstAt + i s`), recording which ones the broker acknowledged. The MQTT client keeps
 * unacknowledged messages and sends them again after a reconnect.
 */
export function mqttPublisher(url: string | (() => string), device: Device, options: { metric: string; firstAt: number; everyMs: number; value?: number }) {
  const acked = new Set<number>()
  const published = new Set<number>()
  const pending = new Set<Promise<unknown>>()
  const failures: string[] = []
  let reconnects = 0
  let stopped = false
  let seq = 0
  const client: MqttClient = mqtt.connect(typeof url === 'string' ? url : url(), {
    username: String(device.deviceId),
    password: device.token,
    clientId: `fault-device-${device.deviceId}-${process.pid}`,
    reconnectPeriod: 250,
    connectTimeout: 3000,
    keepalive: 30,
    // Publishes made while disconnected wait in the client and go out after the reconnect.
    queueQoSZero: false,
  })
  client.on('reconnect', () => reconnects++)
  client.on('error', () => {}) // refused connects while the server is away; the client retries
  const timeOf = (i: number) => options.firstAt + i * 1000
  const loop = (async () => {
    while (!stopped) {
      const i = seq++
      const at = timeOf(i)
      published.add(at)
      const payload = JSON.stringify({
        v: 1,
        readings: [{ metric: options.metric, value: options.value ?? 25 + (i % 10) / 10, time: new Date(at).toISOString() }],
      })
      const p = client.publishAsync(readingsTopic(device.deviceId), payload, { qos: 1 }).then(
        () => acked.add(at),
        (error: Error) => void failures.push(error.message),
      )
      pending.add(p)
      void p.finally(() => pending.delete(p))
      await sleep(options.everyMs)
    }
  })()
  return {
    client,
    acked,
    published,
    /** Publishes the client itself gave up on (never acknowledged), with its reason. */
    failures,
    get reconnects() {
      return reconnects
    },
    /**
     * Stops publishing and waits for the acknowledgements still due, for as long as they keep
     * coming (a busy machine drains a backlog slowly); gives up after `stallMs` without one.
     */
    async stop(stallMs = 20_000) {
      stopped = true
      await loop
      let left = pending.size
      let lastProgress = Date.now()
      while (pending.size && Date.now() - lastProgress < stallMs) {
        await sleep(100)
        if (pending.size < left) {
          left = pending.size
          lastProgress = Date.now()
        }
      }
      return { unacked: pending.size }
    },
    async close() {
      await client.endAsync(true)
    },
  }
}

export type HttpOutcome = { status: number; retryAfter: string | null; at: number }

/** A device posting one reading at a time over HTTP, recording what the server said to each. */
export function httpPoster(baseUrl: string, device: Device, options: { metric: string; firstAt: number; everyMs: number; value?: number }) {
  const accepted = new Set<number>()
  const outcomes: HttpOutcome[] = []
  let stopped = false
  let seq = 0
  const loop = (async () => {
    while (!stopped) {
      const at = options.firstAt + seq++ * 1000
      const body = JSON.stringify({
        v: 1,
        readings: [{ metric: options.metric, value: options.value ?? 7 + (seq % 10) / 100, time: new Date(at).toISOString() }],
      })
      try {
        const res = await fetch(`${baseUrl}/api/v1/readings`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', authorization: `Bearer ${device.token}` },
          body,
          signal: AbortSignal.timeout(20_000),
        })
        outcomes.push({ status: res.status, retryAfter: res.headers.get('retry-after'), at: Date.now() })
        const answer = (await res.json()) as { accepted?: number; results?: Array<{ outcome: string }> }
        if (res.ok && answer.results?.[0]?.outcome === 'accepted') accepted.add(at)
      } catch {
        outcomes.push({ status: 0, retryAfter: null, at: Date.now() })
      }
      await sleep(options.everyMs)
    }
  })()
  return {
    accepted,
    outcomes,
    async stop() {
      stopped = true
      await loop
    },
  }
}
