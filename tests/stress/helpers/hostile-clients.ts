import { readFileSync } from 'node:fs'
import WebSocket from 'ws'
import { readingsTopic } from '@shared/ingest/contract'
import { connectPacket, publishHeader, rawSocket, streamZeros } from '../../helpers/mqtt-raw'
import { sleep } from '../../helpers/wait'

/** Resident memory of a process, in MB, from /proc. */
export function rssMb(pid: number) {
  const match = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'))
  return match ? Number(match[1]) / 1024 : 0
}

export type Attack = { rounds: number; errors: number; stop: () => Promise<void> }

/** Runs `round` again and again on `lanes` parallel lanes until stopped; counts rounds and failures. */
export function repeat(lanes: number, round: () => Promise<unknown>, pauseMs = 50): Attack {
  let stopped = false
  const attack: Attack = {
    rounds: 0,
    errors: 0,
    stop: async () => {
      stopped = true
      await running
    },
  }
  const lane = async () => {
    while (!stopped) {
      try {
        await round()
        attack.rounds++
        await sleep(pauseMs)
      } catch {
        attack.errors++
        await sleep(100)
      }
    }
  }
  const running = Promise.all(Array.from({ length: lanes }, lane))
  return attack
}

/** Before sign-in: a PUBLISH announcing 80 MiB as the first packet, then its body streamed. */
export async function hugePacketBeforeConnect(mqttPort: number) {
  const raw = await rawSocket(mqttPort)
  raw.socket.write(publishHeader('tankwarden/v1/devices/1/readings', 80 * 1024 * 1024))
  await Promise.race([streamZeros(raw, 80 * 1024 * 1024), sleep(10_000)])
  raw.socket.destroy()
}

/** A signed-in device sending a 20 MB message. */
export async function oversizeMessage(mqttPort: number, device: { deviceId: number; token: string }, clientId: string) {
  const raw = await rawSocket(mqttPort)
  raw.socket.write(connectPacket(String(device.deviceId), device.token, clientId))
  raw.socket.write(publishHeader(readingsTopic(device.deviceId), 20_000_000))
  await Promise.race([streamZeros(raw, 20_000_000), sleep(10_000)])
  raw.socket.destroy()
}

/**
 * A live-socket client that signs in, stops reading, and asks for a 300-day catch-up 300 times;
 * ends when the server drops it (or after `holdMs`).
 */
export async function deafLiveClient(baseUrl: string, token: string, siteId: number, holdMs = 15_000) {
  const ws = new WebSocket(`${baseUrl.replace(/^http/, 'ws')}/ws`)
  ws.on('error', () => {})
  const closed = new Promise<void>((resolve) => ws.once('close', () => resolve()))
  await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
  ws.send(JSON.stringify({ type: 'auth', token }))
  await sleep(200)
  ;(ws as unknown as { _socket: { pause: () => void } })._socket.pause()
  const frame = JSON.stringify({ type: 'subscribe', siteId, since: new Date(Date.now() - 300 * 86400_000).toISOString() })
  for (let i = 0; i < 300 && ws.readyState === ws.OPEN; i++) ws.send(frame)
  await Promise.race([closed, sleep(holdMs)])
  ws.terminate()
}

/** GET a URL every `everyMs`, keeping each answer's latency (ms) and status. */
export function prober(url: string, token: string, everyMs: number) {
  const samples: Array<{ ms: number; status: number }> = []
  let stopped = false
  const loop = (async () => {
    while (!stopped) {
      const started = performance.now()
      try {
        const res = await fetch(url, { headers: { authorization: `Bearer ${token}` }, signal: AbortSignal.timeout(10_000) })
        await res.arrayBuffer()
        samples.push({ ms: performance.now() - started, status: res.status })
      } catch {
        samples.push({ ms: performance.now() - started, status: 0 })
      }
      await sleep(everyMs)
    }
  })()
  return {
    samples,
    async stop() {
      stopped = true
      await loop
    },
  }
}

export function percentile(values: number[], p: number) {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? 0
}
