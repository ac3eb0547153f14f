import { z } from 'zod'
import { instantSchema } from '../schemas/time'

/**
 * The device contract, version 1 — the same JSON over MQTT and HTTP.
 *
 * MQTT: connect with username = the device id, password = the device token.
 *   publish readings to  tankwarden/v1/devices/{deviceId}/readings   (QoS 0 or 1)
 *   subscribe only to    tankwarden/v1/devices/{deviceId}/commands and …/{deviceId}/outcomes
 *   each message's outcome (stored, duplicate, refused: reason and field) is published on …/outcomes;
 *   rejected readings are also recorded on the device (last error, counter) and shown in the devices table.
 * HTTP: POST /api/v1/readings with `Authorization: Bearer <device token>`.
 */
export const CONTRACT_VERSION = 1
export const TOPIC_PREFIX = 'tankwarden/v1/devices'
export const MAX_READINGS_PER_MESSAGE = 1000
export const MAX_PAYLOAD_BYTES = 256 * 1024

export const readingsTopic = (deviceId: number | string) => `${TOPIC_PREFIX}/${deviceId}/readings`
export const commandsTopic = (deviceId: number | string) => `${TOPIC_PREFIX}/${deviceId}/commands`
export const outcomesTopic = (deviceId: number | string) => `${TOPIC_PREFIX}/${deviceId}/outcomes`

// One spelling per device: `01` is not device 1, so topic ACLs elsewhere (e.g. a broker's `%u`) agree with ours.
const TOPIC_RE = /^tankwarden\/v1\/devices\/([1-9]\d{0,9})\/(readings|commands|outcomes)$/

export type DeviceChannel = 'readings' | 'commands' | 'outcomes'

export function parseDeviceTopic(topic: string): { deviceId: number; channel: DeviceChannel } | null {
  const match = TOPIC_RE.exec(topic)
  if (!match) return null
  return { deviceId: Number(match[1]), channel: match[2] as DeviceChannel }
}

/** One reading as a device sends it: any accepted unit, ISO 8601 time with a zone. */
export const deviceReadingSchema = z.object({
  metric: z.string().min(1).max(40),
  value: z.number().finite(),
  unit: z.string().min(1).max(20).optional(),
  time: instantSchema,
})
export type DeviceReading = z.infer<typeof deviceReadingSchema>

export const readingsMessageSchema = z.object({
  v: z.literal(CONTRACT_VERSION),
  readings: z.array(z.unknown()).min(1).max(MAX_READINGS_PER_MESSAGE),
})
export type ReadingsMessage = { v: 1; readings: DeviceReading[] }

export type ReadingOutcome =
  { index: number; outcome: 'accepted' } | { index: number; outcome: 'duplicate' } | { index: number; outcome: 'rejected'; reason: string; field?: string }

export interface IngestSummary {
  accepted: number
  duplicates: number
  rejected: number
  results: ReadingOutcome[]
}

/**
 * What a device hears on its outcomes topic after each readings message. `stored`: at least one
 * reading was new; `duplicate`: none new, some already stored; `refused`: nothing stored, either the
 * whole message (`reason`, `field`: not JSON, wrong envelope, too large) or every reading in it.
 * `results` lists the readings that were not stored as new, rejections with reason and field.
 */
export type MessageOutcome = {
  v: typeof CONTRACT_VERSION
  /** The MQTT packet id of a QoS 1 message; null for QoS 0. */
  messageId: number | null
  outcome: 'stored' | 'duplicate' | 'refused'
  accepted: number
  duplicates: number
  rejected: number
  reason?: string
  field?: string
  results: Array<Exclude<ReadingOutcome, { outcome: 'accepted' }>>
}

export function messageOutcome(messageId: number | null, summary: IngestSummary): MessageOutcome {
  const { accepted, duplicates, rejected } = summary
  const outcome = accepted ? 'stored' : duplicates ? 'duplicate' : 'refused'
  const results = summary.results.filter((r): r is Exclude<ReadingOutcome, { outcome: 'accepted' }> => r.outcome !== 'accepted')
  return { v: CONTRACT_VERSION, messageId, outcome, accepted, duplicates, rejected, results }
}

export function messageRefused(messageId: number | null, reason: string, field: string): MessageOutcome {
  return { v: CONTRACT_VERSION, messageId, outcome: 'refused', accepted: 0, duplicates: 0, rejected: 0, reason, field, results: [] }
}

/** Device token format: `twd_<deviceId>_<secret>`, so the server finds the device without a scan. */
export function parseDeviceToken(token: string): { deviceId: number; secret: string } | null {
  const match = /^twd_(\d{1,10})_([A-Za-z0-9_-]{20,100})$/.exec(token)
  return match ? { deviceId: Number(match[1]), secret: match[2] } : null
}
