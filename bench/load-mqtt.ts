// A load generator in its own process, so the app's memory and CPU figures are the app's alone.
// Receives { url, devices, ratePerSecond, seconds, timeBaseMs, pauseMs? } over IPC; reports
// 'connected' once every connection is open, waits pauseMs (so the suite can read the app's memory
// with the connections idle), then publishes and reports { sent, acked, errors, ackP50, ackP99 }.
// Each connection publishes once a second, at its own offset within the second so the load is even,
// one message per second of up to MAX_READINGS_PER_MESSAGE readings (more messages when a connection's
// share is larger).
import mqtt, { type MqttClient } from 'mqtt'
import { MAX_READINGS_PER_MESSAGE, readingsTopic } from '@shared/ingest/contract'

type Job = {
  url: string
  devices: Array<{ deviceId: number; token: string }>
  ratePerSecond: number
  seconds: number
  timeBaseMs: number
  pauseMs?: number
}

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN

process.on('message', async (job: Job) => {
  const clients: MqttClient[] = []
  for (let i = 0; i < job.devices.length; i += 50) {
    const chunk = job.devices.slice(i, i + 50)
    clients.push(
      ...(await Promise.all(
        chunk.map((d) =>
          mqtt.connectAsync(job.url, {
            username: String(d.deviceId),
            password: d.token,
            reconnectPeriod: 1000,
            clientId: `bench-${d.deviceId}-${process.pid}`,
          }),
        ),
      )),
    )
  }
  process.send!({ type: 'connected', clients: clients.length })
  if (job.pauseMs) await new Promise((r) => setTimeout(r, job.pauseMs))
  const perClientPerSecond = Math.max(1, Math.round(job.ratePerSecond / clients.length))
  let sent = 0
  let acked = 0
  let errors = 0
  // Publish → PUBACK of each message, which the app sends once the message's rows are committed.
  const ackMs: number[] = []
  const started = Date.now()
  const pending: Promise<unknown>[] = []
  await Promise.all(
    clients.map(async (client, c) => {
      const offsetMs = Math.floor((c / clients.length) * 1000)
      for (let second = 0; second < job.seconds; second++) {
        const wait = started + second * 1000 + offsetMs - Date.now()
        if (wait > 0) await new Promise((r) => setTimeout(r, wait))
        for (let from = 0; from < perClientPerSecond; from += MAX_READINGS_PER_MESSAGE) {
          const count = Math.min(MAX_READINGS_PER_MESSAGE, perClientPerSecond - from)
          const readings = Array.from({ length: count }, (_, k) => ({
            metric: 'temperature',
            value: 25 + ((c + k) % 20) / 10,
            // Distinct times per device: a millisecond apart, a second's worth per second.
            time: new Date(job.timeBaseMs + second * 1000 + ((from + k) % 1000) + Math.floor((from + k) / 1000) * job.seconds * 1000).toISOString(),
          }))
          sent += readings.length
          const at = performance.now()
          pending.push(
            client.publishAsync(readingsTopic(job.devices[c].deviceId), JSON.stringify({ v: 1, readings }), { qos: 1 }).then(
              () => {
                acked += readings.length
                ackMs.push(performance.now() - at)
              },
              () => void errors++,
            ),
          )
        }
      }
    }),
  )
  await Promise.allSettled(pending)
  const elapsedMs = Date.now() - started
  ackMs.sort((a, b) => a - b)
  // From the first publish to the last acknowledgement: connecting is not ingest time.
  process.send!({ type: 'done', sent, acked, errors, elapsedMs, ackP50: percentile(ackMs, 50), ackP99: percentile(ackMs, 99) })
  await Promise.all(clients.map((c) => c.endAsync()))
  process.exit(0)
})
