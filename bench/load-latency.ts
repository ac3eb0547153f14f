// Steady readings stamped with the moment they are published, for the publish → screen latency.
import mqtt from 'mqtt'
import { readingsTopic } from '@shared/ingest/contract'

type Job = { url: string; devices: Array<{ deviceId: number; token: string }>; ratePerSecond: number; seconds: number }

process.on('message', async (job: Job) => {
  const clients = await Promise.all(
    job.devices.map((d) => mqtt.connectAsync(job.url, { username: String(d.deviceId), password: d.token, clientId: `lat-${d.deviceId}` })),
  )
  const intervalMs = (1000 * clients.length) / job.ratePerSecond
  const end = Date.now() + job.seconds * 1000
  let i = 0
  while (Date.now() < end) {
    const c = i++ % clients.length
    const time = new Date().toISOString()
    void clients[c].publishAsync(readingsTopic(job.devices[c].deviceId), JSON.stringify({ v: 1, readings: [{ metric: 'ph', value: 7, time }] }), { qos: 1 })
    if (c === clients.length - 1) await new Promise((r) => setTimeout(r, intervalMs))
  }
  await new Promise((r) => setTimeout(r, 500))
  process.send!({ type: 'done' })
  await Promise.all(clients.map((c) => c.endAsync()))
  process.exit(0)
})
