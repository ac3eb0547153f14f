import type { IngestSummary } from '@shared/ingest/contract'

export interface TransportOptions {
  /** mqtt://host:port for MQTT, the app's base URL (http://host:port) for HTTP. */
  url: string
  deviceId: number | string
  token: string
}

export interface SendOutcome {
  /** The broker acknowledged (MQTT) or the API answered 2xx (HTTP). */
  delivered: boolean
  /** MQTT only: offline, left in the client's queue to go out after reconnecting. */
  queued?: boolean
  /** HTTP only: the server's per-reading verdict. */
  summary?: IngestSummary
  status?: number
  retryAfterS?: number
  error?: string
}

export interface Transport {
  readonly kind: 'mqtt' | 'http'
  /** Sends `{v:1, readings}`; readings are passed through untouched so faulty ones reach the server. */
  send(readings: unknown[]): Promise<SendOutcome>
  /** Sends a body as is (malformed-message scenario). */
  sendRaw(body: string): Promise<SendOutcome>
  close(): Promise<void>
}

export const readingsBody = (readings: unknown[]): string => JSON.stringify({ v: 1, readings })
