import { z } from 'zod'
import type { AlertChannels, PublicPushConfig, PublicPushSubscription, pushSubscriptionBodySchema } from '@shared/schemas/push'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import type { PushSubscription } from '../models'
import { badRequest, conflict, notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import { endpointAllowed } from './deliver'
import { enqueuePush } from './outbox'
import { vapidKeysFor } from './vapid'

export const DEFAULT_CHANNELS: AlertChannels = { warning: 'mail', alarm: 'mail' }

export function presentSubscription(s: PushSubscription): PublicPushSubscription {
  return {
    id: s.id,
    label: s.label,
    service: new URL(s.endpoint).host,
    status: s.status,
    expiredAt: s.expiredAt?.toISOString() ?? null,
    lastSentAt: s.lastSentAt?.toISOString() ?? null,
    createdAt: s.createdAt.toISOString(),
  }
}

/** A person's own browsers that show their alerts, and their choice of channel per severity. */
export const pushDevicesService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function own(actor: UserActor, id: number) {
    const subscription = await models.PushSubscription.findOne({ where: { id, userId: actor.userId } })
    if (!subscription) throw notFound('No such device among yours')
    return subscription
  }

  return {
    config(): PublicPushConfig {
      return { publicKey: vapidKeysFor(ctx).publicKey }
    },

    async list(actor: UserActor): Promise<PublicPushSubscription[]> {
      const rows = await models.PushSubscription.findAll({ where: { userId: actor.userId }, order: [['id', 'ASC']] })
      return rows.map(presentSubscription)
    },

    /**
     * Adds this browser, or takes it over when it was someone else's (a shared phone follows whoever
     * enabled notifications on it last) or had expired: one endpoint, one row.
     */
    async subscribe(actor: UserActor, body: z.output<typeof pushSubscriptionBodySchema>): Promise<PublicPushSubscription> {
      if (!endpointAllowed(body.endpoint, ctx.config.env))
        throw badRequest('The push service must be reached over https', { endpoint: 'must be an https:// URL' })
      const values = { userId: actor.userId, p256dh: body.keys.p256dh, auth: body.keys.auth, label: body.label, status: 'active' as const, expiredAt: null }
      const existing = await models.PushSubscription.findOne({ where: { endpoint: body.endpoint } })
      const row = existing ? await existing.update(values) : await models.PushSubscription.create({ ...values, endpoint: body.endpoint })
      return presentSubscription(row)
    },

    async remove(actor: UserActor, id: number): Promise<void> {
      await (await own(actor, id)).destroy()
    },

    /** A test notification to one device, through the outbox like any alert. */
    async test(actor: UserActor, id: number): Promise<{ queued: boolean }> {
      const subscription = await own(actor, id)
      if (subscription.status !== 'active') throw conflict('device_expired', 'This device no longer accepts notifications: enable them again on it')
      await enqueuePush(ctx, {
        kind: 'test',
        userId: actor.userId,
        organizationId: actor.organizationId,
        subscriptionId: id,
        // Taps in quick succession send one test, not a burst.
        dedupeKey: `test:${id}:${Math.floor(Date.now() / 10_000)}`,
        payload: { title: 'Tankwarden test notification', body: `Alerts will reach ${subscription.label} like this.`, tag: `test-${id}`, url: '/account' },
      })
      return { queued: true }
    },

    async channels(actor: UserActor): Promise<AlertChannels> {
      const row = await models.AlertChannelChoice.findByPk(actor.userId)
      return row ? { warning: row.warning, alarm: row.alarm } : { ...DEFAULT_CHANNELS }
    },

    async setChannels(actor: UserActor, choice: AlertChannels): Promise<AlertChannels> {
      await models.AlertChannelChoice.upsert({ userId: actor.userId, warning: choice.warning, alarm: choice.alarm })
      return choice
    },
  }
})
