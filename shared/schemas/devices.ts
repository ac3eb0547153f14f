import { z } from 'zod'
import { idSchema } from './common'
import { METRIC_KEYS, type MetricKey } from '../metrics/registry'

export const deviceInputSchema = z.object({
  tankId: z.number().int().positive(),
  name: z.string().trim().min(1, 'required').max(120),
  metrics: z.array(z.enum(METRIC_KEYS)).min(1, 'choose at least one metric').max(METRIC_KEYS.length),
  /** How often the device is expected to report; overdue by more than three intervals means `quiet`. */
  intervalSeconds: z.number().int().min(1).max(86400),
  /** The device calibrates its probes itself: stored readings are left as it sends them. */
  selfCalibrating: z.boolean().optional(),
})
export type DeviceInput = z.infer<typeof deviceInputSchema>
export const deviceUpdateSchema = deviceInputSchema.omit({ tankId: true }).partial()

export const deviceListQuerySchema = z.object({ tankId: idSchema.optional() })

export interface PublicDevice {
  id: number
  tankId: number
  tankName: string
  siteId: number
  name: string
  metrics: MetricKey[]
  intervalSeconds: number
  lastSeenAt: string | null
  lastError: string | null
  lastErrorAt: string | null
  rejectedCount: number
  readingsToday: number
  quiet: boolean
  revokedAt: string | null
  selfCalibrating: boolean
  createdAt: string
}

/** A device is quiet when it is overdue by more than three reporting intervals. */
export function isDeviceQuiet(
  d: { lastSeenAt: string | Date | null; createdAt: string | Date; intervalSeconds: number; revokedAt?: unknown },
  now = Date.now(),
): boolean {
  if (d.revokedAt) return false
  const last = new Date(d.lastSeenAt ?? d.createdAt).getTime()
  return now - last > 3 * d.intervalSeconds * 1000
}

export interface DeviceWithToken {
  device: PublicDevice
  /** Shown once; the server keeps only a hash. */
  token: string
  /** Where the device publishes: the app's own host (null) on the embedded broker's port, or the external broker. */
  broker: { host: string | null; port: number }
}
