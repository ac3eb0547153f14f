// HTTP ingest load in its own process: a closed loop of `concurrency` requests in flight, each a
// batch of `batch` readings from one device, for `seconds`. Reports { sent, accepted, errors }.
type Job = { baseUrl: string; devices: Array<{ deviceId: number; token: string }>; seconds: number; timeBaseMs: number; concurrency: number; batch: number }

process.on('message', async (job: Job) => {
  const end = Date.now() + job.seconds * 1000
  const next = new Map<number, number>() // per device, the next reading's time offset
  let sent = 0
  let accepted = 0
  let errors = 0
  let turn = 0
  async function worker() {
    while (Date.now() < end) {
      const device = job.devices[turn++ % job.devices.length]
      const from = next.get(device.deviceId) ?? 0
      next.set(device.deviceId, from + job.batch)
      const readings = Array.from({ length: job.batch }, (_, k) => ({
        metric: 'temperature',
        value: 25 + (k % 20) / 10,
        time: new Date(job.timeBaseMs + from + k).toISOString(),
      }))
      sent += readings.length
      try {
        const res = await fetch(`${job.baseUrl}/api/v1/readings`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', authorization: `Bearer ${device.token}` },
          body: JSON.stringify({ v: 1, readings }),
        })
        const body = (await res.json()) as { accepted?: number }
        if (res.ok) accepted += body.accepted ?? 0
        else errors++
      } catch {
        errors++
      }
    }
  }
  const started = Date.now()
  await Promise.all(Array.from({ length: job.concurrency }, worker))
  process.send!({ type: 'done', sent, accepted, errors, elapsedMs: Date.now() - started })
  process.exit(0)
})
