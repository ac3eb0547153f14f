// Readings stamped with the moment they are published, for the publish → screen latency, at an even
// rate: each device publishes one message with a reading of each of `metrics` every
// devices × metrics / ratePerSecond seconds, at its own offset. Reports { sent, acked, errors, ackP99 }.
import mqtt, { type MqttClient } from 'mqtt'
import { readingsTopic } from '@shared/ingest/contract'

type Job = { url: string; devices: Array<{ deviceId: number; token: string }>; ratePerSecond: number; seconds: number; metrics?: string[] }

/** A steady value well inside each metric's plausible range. */
const VALUES: Record<string, number> = { temperature: 25.5, ph: 7.1, conductivity: 450, oxygen: 7.5 }

process.on('message', async (job: Job) => {
  const metrics = job.metrics ?? ['ph']
  const clients: MqttClient[] = []
  for (let i = 0; i < job.devices.length; i += 100) {
    const chunk = job.devices.slice(i, i + 100)
    clients.push(
      ...(await Promise.all(
        chunk.map((d) => mqtt.connectAsync(job.url, { username: String(d.deviceId), password: d.token, clientId: `lat-${d.deviceId}`, reconnectPeriod: 1000 })),
      )),
    )
  }
  process.send!({ type: 'connected', clients: clients.length })
  const periodMs = (1000 * clients.length * metrics.length) / job.ratePerSecond
  let sent = 0
  let acked = 0
  let errors = 0
  const ackMs: number[] = []
  const pending: Promise<unknown>[] = []
  const started = Date.now()
  const end = started + job.seconds * 1000
  await Promise.all(
    clients.map(async (client, c) => {
      for (let at = started + (c / clients.length) * periodMs; at < end; at += periodMs) {
        const wait = at - Date.now()
        if (wait > 0) await new Promise((r) => setTimeout(r, wait))
        const time = new Date().toISOString()
        const readings = metrics.map((metric) => ({ metric, value: VALUES[metric] ?? 1, time }))
        const t = performance.now()
        sent += readings.length
        pending.push(
          client.publishAsync(readingsTopic(job.devices[c].deviceId), JSON.stringify({ v: 1, readings }), { qos: 1 }).then(
            () => {
              acked += readings.length
              ackMs.push(performance.now() - t)
            },
            () => void errors++,
          ),
        )
      }
    }),
  )
  await Promise.allSettled(pending)
  await new Promise((r) => setTimeout(r, 500))
  ackMs.sort((a, b) => a - b)
  process.send!({ type: 'done', sent, acked, errors, elapsedMs: Date.now() - started, ackP99: ackMs[Math.floor(0.99 * (ackMs.length - 1))] ?? NaN })
  await Promise.all(clients.map((c) => c.endAsync()))
  process.exit(0)
})
