import { QueryTypes, type Transaction } from 'sequelize'
import type { PushPayload } from '@shared/schemas/push'
import type { AppContext } from '../context'

export type PushKind = 'incident' | 'test'

/** One logical push to a person: a row per browser of theirs that is still reachable. */
export type OutgoingPush = {
  kind: PushKind
  userId: number
  organizationId: number | null
  incidentId?: number | null
  payload: PushPayload
  urgency?: 'normal' | 'high'
  /** Names the logical push (e.g. `incident:42:opened:once:user:7`); a second enqueue with it is ignored. */
  dedupeKey: string
  /** One subscription only (a device's test); otherwise every active one of the person. */
  subscriptionId?: number
}

const INSERT_SQL = `
INSERT INTO push_outbox (organization_id, subscription_id, user_id, kind, incident_id, payload, urgency, topic, dedupe_key)
SELECT $1, s.id, s.user_id, $2, $3, $4::jsonb, $5, $6, $7 || ':sub:' || s.id
FROM push_subscriptions s
WHERE s.user_id = $8 AND s.status = 'active' AND ($9::int IS NULL OR s.id = $9)
ON CONFLICT (dedupe_key) DO NOTHING
RETURNING id`

/** RFC 8030 §5.4: a topic is at most 32 characters of the URL-safe base64 alphabet. */
const topicOf = (tag: string) => tag.replace(/[^A-Za-z0-9_-]/g, '-').slice(0, 32)

/**
 * Puts a push for each of the person's active browsers in the outbox, inside the caller's
 * transaction. Answers how many browsers the person has to reach (rows already there count):
 * 0 means this person has no device that can show it.
 */
export async function enqueuePush(ctx: Pick<AppContext, 'sequelize'>, push: OutgoingPush, options: { transaction?: Transaction } = {}): Promise<number> {
  await ctx.sequelize.query(INSERT_SQL, {
    bind: [
      push.organizationId,
      push.kind,
      push.incidentId ?? null,
      JSON.stringify(push.payload),
      push.urgency ?? 'normal',
      topicOf(push.payload.tag),
      push.dedupeKey,
      push.userId,
      push.subscriptionId ?? null,
    ],
    type: QueryTypes.SELECT,
    transaction: options.transaction,
  })
  const [row] = await ctx.sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM push_subscriptions WHERE user_id = $1 AND status = 'active' AND ($2::int IS NULL OR id = $2)`,
    { bind: [push.userId, push.subscriptionId ?? null], type: QueryTypes.SELECT, transaction: options.transaction },
  )
  return row.n
}

/** The people an incident was pushed to (for the all-clear and for "whoever was told before"). */
export async function pushedUserIds(ctx: Pick<AppContext, 'sequelize'>, incidentId: number, transaction?: Transaction): Promise<number[]> {
  const rows = await ctx.sequelize.query<{ user_id: number }>(`SELECT DISTINCT user_id FROM push_outbox WHERE incident_id = $1 AND kind = 'incident'`, {
    bind: [incidentId],
    type: QueryTypes.SELECT,
    transaction,
  })
  return rows.map((r) => r.user_id)
}
