import webPush from 'web-push'
import type { Config } from '../config'
import type { VapidKeys } from './vapid'

export type PushTarget = { endpoint: string; p256dh: string; auth: string }
export type PushMessage = { payload: string; urgency: 'very-low' | 'low' | 'normal' | 'high'; topic?: string | null; ttlSeconds: number }

/** What the push service made of one message (RFC 8030 §5, §7.3). */
export type DeliveryOutcome =
  | { kind: 'sent' }
  /** 404 or 410: the subscription no longer exists; never try it again. */
  | { kind: 'gone'; status: number }
  /** 429, 5xx, a timeout or no answer: try again later. */
  | { kind: 'retry'; error: string }
  /** Any other refusal (400 malformed, 413 too large, 401/403 keys refused): trying again would not help. */
  | { kind: 'refused'; error: string }

const LOOPBACK = new Set(['127.0.0.1', 'localhost', '[::1]'])

/**
 * Push services are reached over HTTPS. Plain HTTP is accepted only outside production and only to
 * this machine, where the tests' fake push service listens; anything else is refused before a
 * request is made, so a subscription cannot aim the server's requests at the local network.
 */
export function endpointAllowed(endpoint: string, env: Config['env']): boolean {
  let url: URL
  try {
    url = new URL(endpoint)
  } catch {
    return false
  }
  if (url.protocol === 'https:') return true
  return url.protocol === 'http:' && env !== 'production' && LOOPBACK.has(url.hostname)
}

/**
 * Encrypts the payload to the subscription's keys (RFC 8291, aes128gcm) and signs the VAPID
 * header (RFC 8292) with web-push, then sends the request itself, so a timeout and the answer's
 * status are ours to read.
 */
export async function deliverPush(target: PushTarget, message: PushMessage, vapid: VapidKeys, timeoutMs: number): Promise<DeliveryOutcome> {
  const details = webPush.generateRequestDetails({ endpoint: target.endpoint, keys: { p256dh: target.p256dh, auth: target.auth } }, message.payload, {
    vapidDetails: vapid,
    TTL: message.ttlSeconds,
    urgency: message.urgency,
    ...(message.topic ? { topic: message.topic } : {}),
    contentEncoding: 'aes128gcm',
  })
  let response: Response
  try {
    response = await fetch(details.endpoint, {
      method: 'POST',
      headers: Object.fromEntries(Object.entries(details.headers).map(([k, v]) => [k, String(v)])),
      body: details.body ? new Uint8Array(details.body) : undefined,
      signal: AbortSignal.timeout(timeoutMs),
      redirect: 'error',
    })
  } catch (error) {
    return { kind: 'retry', error: `no answer from the push service: ${error instanceof Error ? error.message : String(error)}` }
  }
  const text = (await response.text().catch(() => '')).slice(0, 300)
  const said = `push service answered ${response.status}${text ? `: ${text}` : ''}`
  if (response.ok) return { kind: 'sent' }
  if (response.status === 404 || response.status === 410) return { kind: 'gone', status: response.status }
  if (response.status === 429 || response.status >= 500) return { kind: 'retry', error: said }
  return { kind: 'refused', error: said }
}
