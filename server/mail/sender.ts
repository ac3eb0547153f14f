import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import { ORGANIZATION_HEADER } from './fake-smtp'
import type { MailTransport } from './transport'
import type { OutboxAttachment } from './types'

export type RetryPolicy = { baseMs: number; maxMs: number; maxAttempts: number }
export const DEFAULT_RETRY: RetryPolicy = { baseMs: 15_000, maxMs: 5 * 60_000, maxAttempts: 100 }

export type SenderOptions = {
  transport: MailTransport
  pollMs?: number
  batch?: number
  /** No timer: rows are sent only when `runOnce()` is called (tests). */
  manual?: boolean
  retry?: Partial<RetryPolicy>
  /** A row claimed longer ago than this belongs to an instance that died mid-send. */
  staleAfterMs?: number
  /** Hard limit for one SMTP delivery; kept below `staleAfterMs` so a slow send is never taken over. */
  sendTimeoutMs?: number
}

export type RunResult = { claimed: number; sent: number; retried: number; failed: number; released: number }
export type OutboxSender = { runOnce: () => Promise<RunResult>; stop: () => Promise<void> }

type OutboxRow = {
  id: number
  organization_id: number | null
  kind: string
  to_address: string
  subject: string
  text_body: string
  html_body: string | null
  attachments: OutboxAttachment[]
  incident_id: number | null
  attempts: number
  created_at: Date
}

/** The wait after the `attempts`-th failed attempt: base, 2×base, 4×base, … up to the cap. */
export function retryDelayMs(attempts: number, policy: Pick<RetryPolicy, 'baseMs' | 'maxMs'> = DEFAULT_RETRY): number {
  return Math.min(policy.maxMs, policy.baseMs * 2 ** Math.max(0, attempts - 1))
}

const RECLAIM_SQL = `
UPDATE mail_outbox
SET status = CASE WHEN attempts + 1 >= $2 THEN 'failed' ELSE 'pending' END,
    attempts = attempts + 1,
    last_error = 'interrupted while sending (the instance stopped?)',
    next_attempt_at = now(), updated_at = now()
WHERE status = 'sending' AND updated_at < now() - $1 * interval '1 millisecond'`

// SKIP LOCKED: concurrent senders (other instances) each take different rows; a row another
// sender just claimed fails the status re-check and is not taken twice.
const CLAIM_SQL = `
UPDATE mail_outbox SET status = 'sending', updated_at = now()
WHERE id IN (
  SELECT id FROM mail_outbox
  WHERE status = 'pending' AND next_attempt_at <= now()
  ORDER BY id
  FOR UPDATE SKIP LOCKED
  LIMIT $1
)
RETURNING id, organization_id, kind, to_address, subject, text_body, html_body, attachments, incident_id, attempts, created_at`

const SENT_SQL = `
UPDATE mail_outbox
SET status = 'sent', attempts = attempts + 1, sent_at = now(), smtp_message_id = $2, last_error = NULL, updated_at = now()
WHERE id = $1 AND status = 'sending'`

const FAILED_SQL = `
UPDATE mail_outbox
SET status = CASE WHEN attempts + 1 >= $4 THEN 'failed' ELSE 'pending' END,
    attempts = attempts + 1, last_error = $2,
    next_attempt_at = now() + $3 * interval '1 millisecond', updated_at = now()
WHERE id = $1 AND status = 'sending'`

const RELEASE_SQL = `UPDATE mail_outbox SET status = 'pending', updated_at = now() WHERE id = ANY($1::int[]) AND status = 'sending'`

const errorText = (error: unknown) => (error instanceof Error ? error.message : String(error)).slice(0, 1000)

function messageDomain(from: string): string {
  const match = /@([^>\s]+)>?\s*$/.exec(from)
  return match?.[1] ?? 'tankwarden.invalid'
}

/**
 * Delivers due outbox rows through `transport`: claim a batch, send each, mark it sent or schedule
 * a retry with exponential backoff (failed for good after `maxAttempts`). Emits `mail.attempted`
 * after every attempt. Safe with several instances on one database: each row is sent by one.
 */
export function startOutboxSender(ctx: Pick<AppContext, 'sequelize' | 'logger' | 'events' | 'config'>, options: SenderOptions): OutboxSender {
  const { transport } = options
  const pollMs = options.pollMs ?? 1000
  const batch = options.batch ?? 20
  const retry = { ...DEFAULT_RETRY, ...options.retry }
  const staleAfterMs = options.staleAfterMs ?? 120_000
  const sendTimeoutMs = options.sendTimeoutMs ?? 90_000
  const domain = messageDomain(ctx.config.mail.from)
  const query = <T extends object>(sql: string, bind: unknown[], type = QueryTypes.SELECT) =>
    ctx.sequelize.query<T>(sql, { bind, type: type as QueryTypes.SELECT })

  async function deliver(row: OutboxRow): Promise<string> {
    const headers: Record<string, string> = { 'Auto-Submitted': 'auto-generated', 'X-Tankwarden-Kind': row.kind }
    if (row.organization_id) headers[ORGANIZATION_HEADER] = String(row.organization_id)
    const info = await transport.sendMail({
      to: row.to_address,
      subject: row.subject,
      text: row.text_body,
      html: row.html_body ?? undefined,
      attachments: row.attachments.map((a) => ({
        filename: a.filename,
        cid: a.cid,
        contentType: a.contentType,
        content: Buffer.from(a.base64, 'base64'),
      })),
      // Stable across retries, so a receiving system can recognise a repeated delivery.
      messageId: `<outbox-${row.id}.${row.created_at.getTime()}@${domain}>`,
      headers,
      signal: AbortSignal.timeout(sendTimeoutMs),
    })
    return info.messageId
  }

  /** A database hiccup right after a successful send would otherwise leave the row to be sent again. */
  async function markSent(id: number, messageId: string) {
    for (let attempt = 1; ; attempt++) {
      try {
        return await query(SENT_SQL, [id, messageId], QueryTypes.UPDATE)
      } catch (error) {
        if (attempt >= 3) throw error
        await new Promise((r) => setTimeout(r, 500 * attempt))
      }
    }
  }

  async function attempt(row: OutboxRow): Promise<'sent' | 'retried' | 'failed'> {
    const report = { outboxId: row.id, incidentId: row.incident_id, kind: row.kind, to: row.to_address }
    let messageId: string
    try {
      messageId = await deliver(row)
    } catch (error) {
      const attempts = row.attempts + 1
      await query(FAILED_SQL, [row.id, errorText(error), retryDelayMs(attempts, retry), retry.maxAttempts], QueryTypes.UPDATE)
      const outcome = attempts >= retry.maxAttempts ? 'failed' : 'retried'
      ctx.logger.warn({ outboxId: row.id, attempts, err: error }, outcome === 'failed' ? 'mail failed for good' : 'mail will be retried')
      ctx.events.emit('mail.attempted', { ...report, ok: false, error: errorText(error) })
      return outcome
    }
    await markSent(row.id, messageId)
    ctx.events.emit('mail.attempted', { ...report, ok: true })
    return 'sent'
  }

  let stopped = false
  let timer: NodeJS.Timeout | undefined
  let chain: Promise<unknown> = Promise.resolve()

  async function runBatch(): Promise<RunResult> {
    const result: RunResult = { claimed: 0, sent: 0, retried: 0, failed: 0, released: 0 }
    await query(RECLAIM_SQL, [staleAfterMs, retry.maxAttempts], QueryTypes.UPDATE)
    const rows = (await query<OutboxRow>(CLAIM_SQL, [batch])).sort((a, b) => a.id - b.id)
    result.claimed = rows.length
    for (const [index, row] of rows.entries()) {
      if (stopped) {
        // Handed back now rather than after the stale limit, so another instance sends them soon.
        const rest = rows.slice(index).map((r) => r.id)
        await query(RELEASE_SQL, [rest], QueryTypes.UPDATE)
        result.released = rest.length
        break
      }
      result[await attempt(row)]++
    }
    return result
  }

  /** One batch at a time per sender, whether started by the timer or by a caller. */
  function runOnce(): Promise<RunResult> {
    const next = chain.then(runBatch)
    chain = next.catch(() => undefined)
    return next
  }

  async function tick() {
    let delay = pollMs
    try {
      const result = await runOnce()
      if (result.claimed >= batch) delay = 0
    } catch (error) {
      ctx.logger.error({ err: error }, 'mail outbox run failed')
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
