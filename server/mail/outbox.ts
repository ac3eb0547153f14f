import { QueryTypes, type Transaction } from 'sequelize'
import { z } from 'zod'
import type { AppContext } from '../context'
import { MAIL_KINDS, type MailKind, type OutboxAttachment } from './types'

/** One mail to put in the outbox: a rendered template plus who, why and which logical mail it is. */
export type OutgoingMail = {
  kind: MailKind
  to: string
  subject: string
  text: string
  html?: string | null
  attachments?: OutboxAttachment[]
  organizationId?: number | null
  incidentId?: number | null
  /** Names the logical mail (e.g. `incident:42:opened:user:7`); a second enqueue with it is ignored. */
  dedupeKey: string
  /** Not sent before this moment (default: as soon as the sender polls). */
  notBefore?: Date
}

const attachmentSchema = z.object({
  filename: z.string().min(1).max(200),
  cid: z.string().min(1).max(200).optional(),
  contentType: z.string().min(3).max(100),
  base64: z.string().regex(/^[A-Za-z0-9+/]*={0,2}$/, 'attachment content must be base64'),
})

const outgoingSchema = z.object({
  kind: z.enum(MAIL_KINDS),
  to: z.email().max(320),
  // A line break in a subject would start a new header line; a subject is one line.
  subject: z
    .string()
    .trim()
    .min(1)
    .max(400)
    .transform((s) => s.replace(/[\r\n]+/g, ' ')),
  text: z.string().min(1),
  html: z.string().nullish(),
  attachments: z.array(attachmentSchema).max(20).default([]),
  organizationId: z.number().int().positive().nullish(),
  incidentId: z.number().int().positive().nullish(),
  dedupeKey: z.string().min(1).max(500),
  notBefore: z.date().optional(),
})

const INSERT_SQL = `
INSERT INTO mail_outbox
  (organization_id, kind, to_address, subject, text_body, html_body, attachments, incident_id, dedupe_key, next_attempt_at)
VALUES ($1, $2, $3, $4, $5, $6, $7::jsonb, $8, $9, COALESCE($10::timestamptz, now()))
ON CONFLICT (dedupe_key) DO NOTHING
RETURNING id`

/**
 * Puts a mail in the outbox inside the caller's transaction, so a change and the mail about it
 * commit (or roll back) together. Answers the new row's id, or null when a mail with the same
 * dedupe key is already there. Invalid input is a programming error and throws.
 */
export async function enqueueMail(
  ctx: Pick<AppContext, 'sequelize'>,
  message: OutgoingMail,
  options: { transaction?: Transaction } = {},
): Promise<number | null> {
  const m = outgoingSchema.parse(message)
  const rows = await ctx.sequelize.query<{ id: number }>(INSERT_SQL, {
    bind: [
      m.organizationId ?? null,
      m.kind,
      m.to,
      m.subject,
      m.text,
      m.html ?? null,
      JSON.stringify(m.attachments),
      m.incidentId ?? null,
      m.dedupeKey,
      m.notBefore?.toISOString() ?? null,
    ],
    type: QueryTypes.SELECT,
    transaction: options.transaction,
  })
  return rows[0]?.id ?? null
}
