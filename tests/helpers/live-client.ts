import WebSocket from 'ws'
import type { LiveReading, LiveServerMessage } from '@shared/schemas/live'

export type LiveClient = Awaited<ReturnType<typeof openLiveClient>>

/** A real ws client on an instance's /ws: collects every frame and can wait for one matching a predicate. */
export async function openLiveClient(baseUrl: string) {
  const ws = new WebSocket(`${baseUrl.replace(/^http/, 'ws')}/ws`)
  const frames: LiveServerMessage[] = []
  const waiters: Array<{ match: (m: LiveServerMessage) => boolean; resolve: (m: LiveServerMessage) => void }> = []
  ws.on('message', (data) => {
    const message = JSON.parse(data.toString()) as LiveServerMessage
    frames.push(message)
    for (const w of [...waiters]) {
      if (w.match(message)) {
        waiters.splice(waiters.indexOf(w), 1)
        w.resolve(message)
      }
    }
  })
  await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
  const next = (match: (m: LiveServerMessage) => boolean, timeoutMs = 5000) =>
    new Promise<LiveServerMessage>((resolve, reject) => {
      const found = frames.find(match)
      if (found) return resolve(found)
      waiters.push({ match, resolve })
      setTimeout(() => reject(new Error('no such frame in time')), timeoutMs).unref()
    })
  const send = (m: unknown) => ws.send(JSON.stringify(m))
  /** Every reading pushed live (not catch-up), in arrival order. */
  const liveReadings = (): LiveReading[] => frames.flatMap((f) => (f.type === 'readings' && !f.catchUp ? f.readings : []))
  async function subscribe(token: string, tankIds: number[], since?: string) {
    send({ type: 'auth', token })
    await next((m) => m.type === 'ready')
    send({ type: 'subscribe', tankIds, ...(since ? { since } : {}) })
    await next((m) => m.type === 'subscribed')
  }
  const close = () => new Promise<void>((resolve) => (ws.readyState === ws.CLOSED ? resolve() : (ws.once('close', () => resolve()), ws.close())))
  return { ws, frames, next, send, subscribe, liveReadings, close }
}
