import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import { DEFAULT_RETRY, retryDelayMs, type RetryPolicy } from '../mail'
import { deliverPush, endpointAllowed, type DeliveryOutcome } from './deliver'
import { vapidKeysFor } from './vapid'

export type PushSenderOptions = {
  pollMs?: number
  batch?: number
  /** No timer: rows are sent only when `runOnce()` is called (tests). */
  manual?: boolean
  retry?: Partial<RetryPolicy>
  /** A row claimed longer ago than this belongs to an instance that died mid-send. */
  staleAfterMs?: number
  sendTimeoutMs?: number
  /** How long a push service keeps an alert for a device that is off (RFC 8030 §5.2). */
  ttlSeconds?: number
}

export type PushRunResult = { claimed: number; sent: number; retried: number; failed: number; gone: number }
export type PushSender = { runOnce: (now?: Date) => Promise<PushRunResult>; stop: () => Promise<void> }

type Row = {
  id: number
  subscription_id: number | null
  payload: unknown
  urgency: 'normal' | 'high'
  topic: string | null
  attempts: number
  endpoint: string | null
  p256dh: string | null
  auth: string | null
}

const RECLAIM_SQL = `
UPDATE push_outbox SET status = 'pending', attempts = attempts + 1, last_error = 'interrupted while sending (the instance stopped?)', updated_at = now()
WHERE status = 'sending' AND updated_at < now() - $1 * interval '1 millisecond'`

// SKIP LOCKED: senders of other instances each take different rows, so none is pushed twice.
const CLAIM_SQL = `
WITH claimed AS (
  UPDATE push_outbox SET status = 'sending', updated_at = now()
  WHERE id IN (
    SELECT id FROM push_outbox WHERE status = 'pending' AND next_attempt_at <= $2 ORDER BY id FOR UPDATE SKIP LOCKED LIMIT $1
  )
  RETURNING id, subscription_id, payload, urgency, topic, attempts
)
SELECT c.*, s.endpoint, s.p256dh, s.auth
FROM claimed c LEFT JOIN push_subscriptions s ON s.id = c.subscription_id AND s.status = 'active'
ORDER BY c.id`

const DONE_SQL = `
UPDATE push_outbox SET status = $2, attempts = attempts + 1, last_error = $3, sent_at = CASE WHEN $2 = 'sent' THEN now() END, updated_at = now()
WHERE id = $1 AND status = 'sending'`

const RETRY_SQL = `
UPDATE push_outbox
SET status = CASE WHEN attempts + 1 >= $4 THEN 'failed' ELSE 'pending' END,
    attempts = attempts + 1, last_error = $2, next_attempt_at = $3, updated_at = now()
WHERE id = $1 AND status = 'sending'`

/**
 * Delivers due push rows the way the mail sender delivers mail: claim a batch, send each, mark it
 * sent, or schedule a retry with the same backoff (failed for good after `maxAttempts`). A push
 * service answering 404/410 has forgotten the subscription: the row is `gone` and the subscription
 * is marked expired, which its owner sees on the Account page. `runOnce(now)` takes the clock, so
 * a test can play an outage of any length.
 */
export function startPushSender(ctx: Pick<AppContext, 'sequelize' | 'logger' | 'config'>, options: PushSenderOptions = {}): PushSender {
  const pollMs = options.pollMs ?? 1000
  const batch = options.batch ?? 20
  const retry = { ...DEFAULT_RETRY, ...options.retry }
  const staleAfterMs = options.staleAfterMs ?? 120_000
  const sendTimeoutMs = options.sendTimeoutMs ?? 30_000
  const ttlSeconds = options.ttlSeconds ?? 24 * 3600
  const update = (sql: string, bind: unknown[]) => ctx.sequelize.query(sql, { bind, type: QueryTypes.UPDATE })

  async function deliver(row: Row): Promise<DeliveryOutcome> {
    // The subscription was removed or expired after the push was queued: nobody to reach there.
    if (!row.endpoint || !row.p256dh || !row.auth) return { kind: 'gone', status: 0 }
    if (!endpointAllowed(row.endpoint, ctx.config.env)) return { kind: 'refused', error: 'push endpoint must be https' }
    const message = { payload: JSON.stringify(row.payload), urgency: row.urgency, topic: row.topic, ttlSeconds }
    return deliverPush({ endpoint: row.endpoint, p256dh: row.p256dh, auth: row.auth }, message, vapidKeysFor(ctx), sendTimeoutMs)
  }

  /** A database hiccup right after the push service took the push would otherwise leave it to be pushed again. */
  async function markSent(id: number) {
    for (let attempt = 1; ; attempt++) {
      try {
        return await update(DONE_SQL, [id, 'sent', null])
      } catch (error) {
        if (attempt >= 3) throw error
        await new Promise((r) => setTimeout(r, 500 * attempt))
      }
    }
  }

  async function attempt(row: Row, now: Date): Promise<keyof Omit<PushRunResult, 'claimed'>> {
    const outcome = await deliver(row)
    if (outcome.kind === 'sent') {
      await markSent(row.id)
      await update(`UPDATE push_subscriptions SET last_sent_at = now(), updated_at = now() WHERE id = $1`, [row.subscription_id])
      return 'sent'
    }
    if (outcome.kind === 'gone') {
      await update(DONE_SQL, [row.id, 'gone', outcome.status ? `push service answered ${outcome.status}: the subscription has expired` : 'device removed'])
      if (outcome.status) {
        await update(`UPDATE push_subscriptions SET status = 'expired', expired_at = now(), updated_at = now() WHERE id = $1 AND status = 'active'`, [
          row.subscription_id,
        ])
        ctx.logger.info({ subscriptionId: row.subscription_id }, 'push subscription expired')
      }
      return 'gone'
    }
    if (outcome.kind === 'refused') {
      await update(DONE_SQL, [row.id, 'failed', outcome.error])
      ctx.logger.warn({ pushId: row.id, error: outcome.error }, 'push refused for good')
      return 'failed'
    }
    const attempts = row.attempts + 1
    await update(RETRY_SQL, [row.id, outcome.error, new Date(now.getTime() + retryDelayMs(attempts, retry)), retry.maxAttempts])
    ctx.logger.warn({ pushId: row.id, attempts, error: outcome.error }, 'push will be retried')
    return attempts >= retry.maxAttempts ? 'failed' : 'retried'
  }

  let stopped = false
  let timer: NodeJS.Timeout | undefined
  let chain: Promise<unknown> = Promise.resolve()

  async function runBatch(now: Date): Promise<PushRunResult> {
    const result: PushRunResult = { claimed: 0, sent: 0, retried: 0, failed: 0, gone: 0 }
    await update(RECLAIM_SQL, [staleAfterMs])
    const rows = await ctx.sequelize.query<Row>(CLAIM_SQL, { bind: [batch, now], type: QueryTypes.SELECT })
    result.claimed = rows.length
    for (const row of rows) result[await attempt(row, now)]++
    return result
  }

  /** One batch at a time per sender, whether started by the timer or by a caller. */
  function runOnce(now = new Date()): Promise<PushRunResult> {
    const next = chain.then(() => runBatch(now))
    chain = next.catch(() => undefined)
    return next
  }

  async function tick() {
    let delay = pollMs
    try {
      if ((await runOnce()).claimed >= batch) delay = 0
    } catch (error) {
      ctx.logger.error({ err: error }, 'push outbox run failed')
    }
    if (!stopped) timer = setTimeout(tick, delay)
  }
  if (!options.manual) timer = setTimeout(tick, 0)

  return {
    runOnce,
    async stop() {
      stopped = true
      clearTimeout(timer)
      await chain
    },
  }
}
