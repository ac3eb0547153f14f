import { QueryTypes } from 'sequelize'
import { closeContext, createContext } from '../../server/bootstrap'
import { testConfig } from '../../server/config'
import type { AppContext } from '../../server/context'
import { startFakeSmtp } from '../../server/mail/fake-smtp'
import type { OutgoingMail } from '../../server/mail/outbox'
import { createMailTransport, type MailTransport } from '../../server/mail/transport'
import { createTestDatabase } from '../helpers/db'

/** A private database, a context, the fake SMTP server on a free port and a transport to it. */
export async function startMailBed() {
  const db = await createTestDatabase()
  const ctx: AppContext = createContext(testConfig({ databaseUrl: db.url }))
  const bed = {
    ctx,
    fake: await startFakeSmtp(ctx, { host: '127.0.0.1', port: 0 }),
    transport: undefined as unknown as MailTransport,
    /** Simulates the mail server going away; `restartSmtp` brings it back on the same port. */
    async stopSmtp() {
      await bed.fake.stop()
    },
    async restartSmtp() {
      bed.fake = await startFakeSmtp(ctx, { host: '127.0.0.1', port: bed.fake.port })
    },
    mailbox: () =>
      ctx.sequelize.query<{
        id: number
        subject: string
        envelope_from: string | null
        envelope_to: string[]
        attachments: Array<{ filename: string; contentType: string; size: number; cid: string | null }>
        html_body: string | null
        text_body: string | null
        headers: Record<string, string>
        organization_id: number | null
      }>('SELECT * FROM fake_mailbox ORDER BY id', { type: QueryTypes.SELECT }),
    outbox: () =>
      ctx.sequelize.query<{
        id: number
        status: string
        attempts: number
        next_attempt_at: Date
        last_error: string | null
        sent_at: Date | null
        smtp_message_id: string | null
        subject: string
      }>('SELECT * FROM mail_outbox ORDER BY id', { type: QueryTypes.SELECT }),
    /** Makes every pending row due now, instead of waiting out the backoff in real time. */
    makeDue: () => ctx.sequelize.query(`UPDATE mail_outbox SET next_attempt_at = now() WHERE status = 'pending'`),
    async close() {
      bed.transport.close()
      await bed.fake.stop()
      await closeContext(ctx)
      await db.drop()
    },
  }
  bed.transport = createMailTransport(ctx.config, { fakeSmtpPort: bed.fake.port })
  return bed
}
export type MailBed = Awaited<ReturnType<typeof startMailBed>>

let counter = 0
/** A minimal valid outbox message with a unique dedupe key. */
export function sampleMail(overrides: Partial<OutgoingMail> = {}): OutgoingMail {
  counter++
  return {
    kind: 'incident_opened',
    to: `keeper${counter}@shop.example`,
    subject: `Test mail ${counter}`,
    text: `Body of test mail ${counter}`,
    dedupeKey: `test:${process.pid}:${counter}`,
    ...overrides,
  }
}
