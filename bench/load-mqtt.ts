// A load generator in its own process, so the app's memory and CPU figures are the app's alone.
// Receives { url, devices, ratePerSecond, seconds, startMs } over IPC; reports { sent, acked, errors }.
import mqtt, { type MqttClient } from 'mqtt'
import { readingsTopic } from '../shared/ingest/contract'

type Job = { url: string; devices: Array<{ deviceId: number; token: string }>; ratePerSecond: number; seconds: number; timeBaseMs: number }

process.on('message', async (job: Job) => {
  const clients: MqttClient[] = []
  for (let i = 0; i < job.devices.length; i += 50) {
    const chunk = job.devices.slice(i, i + 50)
    clients.push(
      ...(await Promise.all(
        chunk.map((d) => mqtt.connectAsync(job.url, { username: String(d.deviceId), password: d.token, reconnectPeriod: 1000, clientId: `bench-${d.deviceId}-${process.pid}` })),
      )),
    )
  }
  process.send!({ type: 'connected', clients: clients.length })
  const perClientPerSecond = job.ratePerSecond / clients.length
  const batch = Math.max(1, Math.round(perClientPerSecond))
  let sent = 0
  let acked = 0
  let errors = 0
  const started = Date.now()
  let second = 0
  const pending: Promise<unknown>[] = []
  while (second < job.seconds) {
    const tickAt = started + second * 1000
    clients.forEach((client, c) => {
      const readings = Array.from({ length: batch }, (_, k) => ({
        metric: 'temperature',
        value: 25 + ((c + k) % 20) / 10,
        // Distinct times per device: second × 1000 + k ms after the time base.
        time: new Date(job.timeBaseMs + second * 1000 + k).toISOString(),
      }))
      sent += readings.length
      pending.push(
        client.publishAsync(readingsTopic(job.devices[c].deviceId), JSON.stringify({ v: 1, readings }), { qos: 1 }).then(
          () => void (acked += readings.length),
          () => void errors++,
        ),
      )
    })
    second++
    const wait = started + second * 1000 - Date.now()
    if (wait > 0) await new Promise((r) => setTimeout(r, wait))
    void tickAt
  }
  await Promise.allSettled(pending)
  process.send!({ type: 'done', sent, acked, errors, elapsedMs: Date.now() - started })
  await Promise.all(clients.map((c) => c.endAsync()))
  process.exit(0)
})
