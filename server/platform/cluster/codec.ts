import type { EventMap, StoredReading } from '../events'

/** Events every instance must hear, whichever instance they happened in. `mail.attempted` stays local. */
export const RELAYED_EVENTS = [
  'readings.stored',
  'incident.changed',
  'rules.changed',
  'device.revoked',
  'calibration.changed',
  'wall.revoked',
  'access.changed',
] as const
export type RelayedEvent = (typeof RELAYED_EVENTS)[number]

/** PostgreSQL refuses NOTIFY payloads of 8000 bytes or more; stay clear of it. */
export const MAX_PAYLOAD_BYTES = 7800

const SOURCE_CODES = { device: 'd', test_kit: 't', import: 'i' } as const
const SOURCES = { d: 'device', t: 'test_kit', i: 'import' } as const
type CompactReading = [tankId: number, metric: string, timeMs: number, value: number, source: 'd' | 't' | 'i']

type Envelope = { o: string; e: RelayedEvent; d: unknown }

const byteLength = (text: string) => Buffer.byteLength(text, 'utf8')

/**
 * Encodes one event as NOTIFY payloads. Readings go as compact tuples, split so each payload
 * stays under the limit; a batch of thousands of rows becomes a few dozen payloads sent in one statement.
 */
export function encodeEvent<K extends RelayedEvent>(origin: string, event: K, args: EventMap[K]): string[] {
  if (event !== 'readings.stored') return [JSON.stringify({ o: origin, e: event, d: args[0] } satisfies Envelope)]
  const rows = (args as EventMap['readings.stored'])[0]
  const head = `{"o":${JSON.stringify(origin)},"e":"readings.stored","d":[`
  const payloads: string[] = []
  let parts: string[] = []
  let size = byteLength(head) + 2
  for (const r of rows) {
    const tuple = JSON.stringify([r.tankId, r.metric, r.time.getTime(), r.value, SOURCE_CODES[r.source]] satisfies CompactReading)
    const add = byteLength(tuple) + 1
    if (parts.length && size + add > MAX_PAYLOAD_BYTES) {
      payloads.push(`${head}${parts.join(',')}]}`)
      parts = []
      size = byteLength(head) + 2
    }
    parts.push(tuple)
    size += add
  }
  if (parts.length) payloads.push(`${head}${parts.join(',')}]}`)
  return payloads
}

export type DecodedEvent = { origin: string; event: RelayedEvent; args: unknown[] }

/** Reads one payload back; null for anything that is not ours or not whole. */
export function decodeEvent(payload: string): DecodedEvent | null {
  let envelope: Envelope
  try {
    envelope = JSON.parse(payload) as Envelope
  } catch {
    return null
  }
  if (!envelope || typeof envelope.o !== 'string' || !(RELAYED_EVENTS as readonly string[]).includes(envelope.e)) return null
  if (envelope.e !== 'readings.stored') return { origin: envelope.o, event: envelope.e, args: [envelope.d] }
  if (!Array.isArray(envelope.d)) return null
  const rows: StoredReading[] = (envelope.d as CompactReading[]).map(([tankId, metric, timeMs, value, source]) => ({
    tankId,
    metric,
    time: new Date(timeMs),
    value,
    source: SOURCES[source],
  }))
  return { origin: envelope.o, event: 'readings.stored', args: [rows] }
}
