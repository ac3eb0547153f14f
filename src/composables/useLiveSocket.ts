import { readonly, ref } from 'vue'
import { LIVE_CLOSE, type LiveClientMessage, type LiveReading, type LiveServerMessage } from '@shared/schemas/live'
import { liveCredential, notifyUnauthorized } from '@/api/session'

export type LiveStatus = 'connecting' | 'live' | 'offline'
export type LiveTarget = { tankIds: number[] } | { siteId: number }
export type ReadingsHandler = (readings: LiveReading[], info: { catchUp: boolean }) => void
export type LiveIncidentChange = Extract<LiveServerMessage, { type: 'incident' }>
export type IncidentHandler = (change: LiveIncidentChange) => void

interface Subscription {
  target: LiveTarget
  onReadings: ReadingsHandler
  onIncident?: IncidentHandler
}

export const RETRY_MIN_MS = 1000
export const RETRY_MAX_MS = 30_000
const PING_EVERY_MS = 20_000
// A half-open connection (Wi-Fi gone, router rebooted) never fires `close` on its own.
const SILENCE_LIMIT_MS = 50_000

// One socket for the whole app: every view shares it and it closes when nobody listens.
const status = ref<LiveStatus>('offline')
const subscriptions = new Set<Subscription>()
let socket: WebSocket | null = null
let ready = false
let retryDelay = RETRY_MIN_MS
let retryTimer: ReturnType<typeof setTimeout> | null = null
let pingTimer: ReturnType<typeof setInterval> | null = null
let lastFrameAt = 0
/** Newest reading time seen: where a reconnect catches up from. */
let newestReadingAt: string | null = null
/** When the socket first went live, for a reconnect before any reading arrived (browser clock). */
let liveSince: string | null = null

export function liveSocketUrl(loc: Pick<Location, 'protocol' | 'host'> = window.location): string {
  return `${loc.protocol === 'https:' ? 'wss:' : 'ws:'}//${loc.host}/ws`
}

/** 1 s, 2 s, 4 s … capped at 30 s. */
export function nextRetryDelay(current: number): number {
  return Math.min(RETRY_MAX_MS, Math.max(RETRY_MIN_MS, current * 2))
}

function send(message: LiveClientMessage) {
  if (socket?.readyState === WebSocket.OPEN) socket.send(JSON.stringify(message))
}

function subscribeFrame(target: LiveTarget, since?: string | null): LiveClientMessage {
  const base = 'siteId' in target ? { siteId: target.siteId } : { tankIds: target.tankIds }
  return since ? { type: 'subscribe', ...base, since } : { type: 'subscribe', ...base }
}

function matches(target: LiveTarget, reading: LiveReading): boolean {
  // The server only sends readings of tanks this socket subscribed to, so a site target takes them all.
  return 'siteId' in target || target.tankIds.includes(reading.tankId)
}

function concerns(target: LiveTarget, change: LiveIncidentChange): boolean {
  return 'siteId' in target ? target.siteId === change.siteId : target.tankIds.includes(change.tankId)
}

function noteNewest(readings: LiveReading[]) {
  for (const reading of readings) {
    if (!newestReadingAt || reading.time > newestReadingAt) newestReadingAt = reading.time
  }
}

function onFrame(data: unknown) {
  lastFrameAt = Date.now()
  let message: LiveServerMessage
  try {
    message = JSON.parse(String(data)) as LiveServerMessage
  } catch {
    return
  }
  if (message.type === 'ready') {
    const since = newestReadingAt ?? liveSince
    ready = true
    retryDelay = RETRY_MIN_MS
    status.value = 'live'
    for (const sub of subscriptions) send(subscribeFrame(sub.target, since))
    liveSince ??= new Date().toISOString()
  } else if (message.type === 'readings' && message.readings.length) {
    noteNewest(message.readings)
    for (const sub of [...subscriptions]) {
      const mine = message.readings.filter((r) => matches(sub.target, r))
      if (mine.length) sub.onReadings(mine, { catchUp: message.catchUp === true })
    }
  } else if (message.type === 'incident') {
    for (const sub of [...subscriptions]) if (sub.onIncident && concerns(sub.target, message)) sub.onIncident(message)
  }
}

function stopTimers() {
  if (retryTimer) clearTimeout(retryTimer)
  if (pingTimer) clearInterval(pingTimer)
  retryTimer = null
  pingTimer = null
}

function scheduleReconnect() {
  if (!subscriptions.size || retryTimer) return
  status.value = 'offline'
  const delay = retryDelay
  retryDelay = nextRetryDelay(retryDelay)
  retryTimer = setTimeout(() => {
    retryTimer = null
    connect()
  }, delay)
}

function connect() {
  if (socket || !subscriptions.size) return
  const credential = liveCredential()
  if (!credential) {
    status.value = 'offline'
    return
  }
  status.value = 'connecting'
  ready = false
  const current = new WebSocket(liveSocketUrl())
  socket = current
  lastFrameAt = Date.now()
  current.onopen = () => current.send(JSON.stringify({ type: 'auth', token: credential } satisfies LiveClientMessage))
  current.onmessage = (event: MessageEvent) => onFrame(event.data)
  current.onclose = (event: CloseEvent) => {
    if (socket !== current) return
    socket = null
    ready = false
    if (pingTimer) clearInterval(pingTimer)
    pingTimer = null
    if (event.code === LIVE_CLOSE.unauthenticated) {
      status.value = 'offline'
      // A person is signed out (which clears every subscription); a display keeps trying.
      notifyUnauthorized()
    }
    scheduleReconnect()
  }
  pingTimer = setInterval(() => {
    if (Date.now() - lastFrameAt > SILENCE_LIMIT_MS) current.close()
    else if (ready) send({ type: 'ping' })
  }, PING_EVERY_MS)
}

function teardown() {
  stopTimers()
  const closing = socket
  socket = null
  ready = false
  closing?.close(1000, 'no subscribers')
  status.value = 'offline'
  retryDelay = RETRY_MIN_MS
  newestReadingAt = null
  liveSince = null
}

/** Listen for readings (and, if asked, incident changes) of some tanks or a whole site; call the result to stop listening. */
export function subscribeLive(target: LiveTarget, onReadings: ReadingsHandler, onIncident?: IncidentHandler): () => void {
  const subscription: Subscription = { target, onReadings, onIncident }
  subscriptions.add(subscription)
  if (ready) send(subscribeFrame(target))
  else connect()
  return () => {
    if (!subscriptions.delete(subscription)) return
    if (!subscriptions.size) return teardown()
    if ('tankIds' in target) {
      const stillWanted = new Set([...subscriptions].flatMap((s) => ('tankIds' in s.target ? s.target.tankIds : [])))
      const unused = target.tankIds.filter((id) => !stillWanted.has(id))
      if (unused.length && ready) send({ type: 'unsubscribe', tankIds: unused })
    }
  }
}

/** Try again now (the network came back) instead of waiting out the backoff. */
export function reconnectLiveNow() {
  if (socket || !subscriptions.size) return
  stopTimers()
  retryDelay = RETRY_MIN_MS
  connect()
}

/** Signing out: forget every subscription and close. */
export function resetLiveSocket() {
  subscriptions.clear()
  teardown()
}

if (typeof window !== 'undefined') window.addEventListener('online', reconnectLiveNow)

export function useLiveSocket() {
  return { status: readonly(status), subscribe: subscribeLive }
}
