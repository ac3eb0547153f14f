// Device side of POST /api/v1/readings: one request per batch, Bearer device token.
import type { IngestSummary } from '@shared/ingest/contract'
import { readingsBody, type SendOutcome, type Transport, type TransportOptions } from './types'

export interface HttpTransportOptions extends TransportOptions {
  timeoutMs?: number
}

function retryAfterSeconds(header: string | null): number | undefined {
  if (!header) return undefined
  const seconds = Number(header)
  if (Number.isFinite(seconds)) return seconds
  const at = Date.parse(header)
  return Number.isNaN(at) ? undefined : Math.max(0, (at - Date.now()) / 1000)
}

async function errorText(response: Response): Promise<string> {
  const text = await response.text().catch(() => '')
  try {
    const parsed = JSON.parse(text) as { error?: { message?: string } }
    return parsed.error?.message ?? text
  } catch {
    return text || response.statusText
  }
}

export function createHttpTransport(options: HttpTransportOptions): Transport {
  const endpoint = new URL('/api/v1/readings', options.url).toString()
  const timeoutMs = options.timeoutMs ?? 10_000

  async function post(body: string): Promise<SendOutcome> {
    try {
      const response = await fetch(endpoint, {
        method: 'POST',
        headers: { authorization: `Bearer ${options.token}`, 'content-type': 'application/json' },
        body,
        signal: AbortSignal.timeout(timeoutMs),
      })
      if (response.ok) {
        return { delivered: true, status: response.status, summary: (await response.json()) as IngestSummary }
      }
      return {
        delivered: false,
        status: response.status,
        retryAfterS: retryAfterSeconds(response.headers.get('retry-after')),
        error: await errorText(response),
      }
    } catch (err) {
      return { delivered: false, error: (err as Error).message }
    }
  }

  return {
    kind: 'http',
    send: (readings) => post(readingsBody(readings)),
    sendRaw: post,
    close: async () => {},
  }
}
