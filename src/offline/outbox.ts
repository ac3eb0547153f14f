import { shallowRef } from 'vue'
import { ApiError, http } from '@/api/client'
import { offlineDb, offlineOwner, type OutboxItem, type OutboxKind } from './db'

export type { OutboxItem, OutboxKind }

/** An entry kept on the phone because the server could not be reached; it goes out when the connection returns. */
export type Waiting = { waiting: true; clientId: string }
export const isWaiting = (result: unknown): result is Waiting => typeof result === 'object' && result !== null && 'waiting' in result

/** The signed-in person's kept entries, oldest first, as last read from storage. */
export const outboxItems = shallowRef<OutboxItem[]>([])
/** Entries that turned out to be done already by someone else: said once, not stored. */
export const outboxNotices = shallowRef<string[]>([])

type Outcome = { sent: unknown } | { error: ApiError }
const outcomes = new Map<string, Outcome>()
/** Entries whose maker is still on the form: a refusal goes back to the form instead of the list. */
const awaited = new Set<string>()
let sending: Promise<void> = Promise.resolve()
let lastSeq = 0

/** The server's answer is final (stored, refused, already done); anything else is tried again later. */
const isFinal = (error: ApiError) => error.status >= 400 && error.status < 500 && error.status !== 401 && error.status !== 408 && error.status !== 429

export async function refreshOutbox() {
  const db = await offlineDb()
  const userId = offlineOwner()
  if (!db || userId == null) {
    outboxItems.value = []
    return
  }
  const items = await db.getAllFromIndex('outbox', 'byUser', userId)
  outboxItems.value = items.sort((a, b) => a.seq - b.seq)
}

async function sendOne(item: OutboxItem): Promise<'next' | 'stop'> {
  const db = await offlineDb()
  try {
    const response = await http.post(item.url, item.body)
    if (awaited.has(item.clientId)) outcomes.set(item.clientId, { sent: response.data })
    await db?.delete('outbox', item.clientId)
    return 'next'
  } catch (caught) {
    const error = caught instanceof ApiError ? caught : new ApiError({ status: 0, code: 'client', message: String(caught) })
    if (!isFinal(error)) return 'stop'
    if (error.code === 'already_done' || awaited.has(item.clientId)) {
      if (error.code === 'already_done' && !awaited.has(item.clientId)) outboxNotices.value = [...outboxNotices.value, `${item.label}: ${error.message}`]
      if (awaited.has(item.clientId)) outcomes.set(item.clientId, { error })
      await db?.delete('outbox', item.clientId)
    } else {
      await db?.put('outbox', { ...item, state: 'refused', reason: error.message, fields: error.fields })
    }
    return 'next'
  }
}

/** Sends the waiting entries one at a time, in the order they were made; stops at the first that cannot get through. */
export function sendWaiting(): Promise<void> {
  sending = sending
    .then(async () => {
      await refreshOutbox()
      for (const item of outboxItems.value) {
        if (item.state !== 'waiting') continue
        if ((await sendOne(item)) === 'stop') break
      }
      await refreshOutbox()
    })
    // Storage that failed once must not stop every later round: the entries stay and are tried again.
    .catch(() => undefined)
  return sending
}

/** A version 4 UUID (RFC 9562); `crypto.randomUUID` exists only on https pages, `getRandomValues` everywhere. */
export function newClientId(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16))
  bytes[6] = (bytes[6]! & 0x0f) | 0x40
  bytes[8] = (bytes[8]! & 0x3f) | 0x80
  const hex = [...bytes].map((b) => b.toString(16).padStart(2, '0')).join('')
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`
}

export type Draft = { kind: OutboxKind; tankId: number; url: string; body: Record<string, unknown>; label: string }

/**
 * Sends an entry with a phone-made id, keeping it on the phone first: the answer, or `Waiting`
 * when the server cannot be reached (it goes out later, after any entry made before it).
 * A refusal (400, 403, 404, 409) rejects as before and leaves nothing behind.
 */
export async function submit<T>(draft: Draft): Promise<T | Waiting> {
  const clientId = newClientId()
  const body = { ...draft.body, clientId }
  const db = await offlineDb()
  const userId = offlineOwner()
  if (!db || userId == null) return (await http.post<T>(draft.url, body)).data
  lastSeq = Math.max(Date.now(), lastSeq + 1)
  const item: OutboxItem = { ...draft, body, clientId, seq: lastSeq, userId, madeAt: new Date().toISOString(), state: 'waiting' }
  await db.put('outbox', item)
  awaited.add(clientId)
  try {
    await sendWaiting()
  } finally {
    awaited.delete(clientId)
  }
  const outcome = outcomes.get(clientId)
  outcomes.delete(clientId)
  if (!outcome) return { waiting: true, clientId }
  if ('error' in outcome) throw outcome.error
  return outcome.sent as T
}

/** A refused entry the keeper gives up on. */
export async function discardKept(clientId: string) {
  await (await offlineDb())?.delete('outbox', clientId)
  await refreshOutbox()
}

/** A refused entry put back in the queue, perhaps with its body corrected. */
export async function retryKept(clientId: string, body?: Record<string, unknown>) {
  const db = await offlineDb()
  const item = await db?.get('outbox', clientId)
  if (!db || !item) return
  await db.put('outbox', { ...item, body: body ? { ...body, clientId } : item.body, state: 'waiting', reason: undefined, fields: undefined })
  await sendWaiting()
}

export function forgetOutboxState() {
  outboxItems.value = []
  outboxNotices.value = []
  outcomes.clear()
}

/** One kept entry of the signed-in person, for fixing a refused one on its form. */
export async function keptItem(clientId: string): Promise<OutboxItem | null> {
  const item = await (await offlineDb())?.get('outbox', clientId)
  return item && item.userId === offlineOwner() ? item : null
}
