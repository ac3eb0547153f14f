import { z } from 'zod'

/** Where a person wants alerts of one severity. */
export const ALERT_CHANNELS = ['mail', 'phone', 'both'] as const
export type AlertChannel = (typeof ALERT_CHANNELS)[number]

export const alertChannelsSchema = z.object({
  warning: z.enum(ALERT_CHANNELS),
  alarm: z.enum(ALERT_CHANNELS),
})
export type AlertChannels = z.output<typeof alertChannelsSchema>

const base64url = (bytes: number, what: string) =>
  z
    .string()
    .regex(/^[A-Za-z0-9_-]+={0,2}$/, `${what} must be base64url`)
    .refine((v) => Math.floor((v.replace(/=+$/, '').length * 3) / 4) === bytes, `${what} must be ${bytes} bytes`)

/** What `PushSubscription.toJSON()` gives in a browser, plus the name the person sees for it. */
export const pushSubscriptionBodySchema = z.object({
  endpoint: z.url({ protocol: /^https?$/ }).max(2048),
  keys: z.object({
    // An uncompressed P-256 point (RFC 8291) and a 16-byte authentication secret.
    p256dh: base64url(65, 'p256dh'),
    auth: base64url(16, 'auth'),
  }),
  label: z.string().trim().min(1).max(80).default('This device'),
})
export type PushSubscriptionBody = z.input<typeof pushSubscriptionBodySchema>

export interface PublicPushSubscription {
  id: number
  label: string
  /** The push service's host, so two devices of one name can be told apart. */
  service: string
  status: 'active' | 'expired'
  expiredAt: string | null
  lastSentAt: string | null
  createdAt: string
}

export interface PublicPushConfig {
  /** The VAPID public key (base64url), for `pushManager.subscribe({ applicationServerKey })`. */
  publicKey: string
}

/**
 * What a push carries to the service worker (encrypted on the way). `ackToken` is a single-use
 * acknowledge token, so the notification's Acknowledge action works without a session.
 */
export interface PushPayload {
  title: string
  body: string
  /** Notifications of one incident replace each other on the device. */
  tag: string
  /** Opened when the notification is tapped (same origin). */
  url: string
  incidentId?: number
  ackToken?: string
  severity?: 'warning' | 'alarm'
}
