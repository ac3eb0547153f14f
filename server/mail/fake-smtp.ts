import { simpleParser, type HeaderValue, type ParsedMail } from 'mailparser'
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server'
import type { AppContext } from '../context'
import type { ReceivedAttachment } from './types'

export type FakeSmtp = { port: number; stop: () => Promise<void>; isRunning: () => boolean }

/** Set by the sender on mail about one organization, so the dev mailbox can show each owner their own. */
export const ORGANIZATION_HEADER = 'x-tankwarden-organization'

const MAX_MESSAGE_BYTES = 10 * 1024 * 1024

function headerText(value: HeaderValue): string {
  if (typeof value === 'string') return value
  if (value instanceof Date) return value.toISOString()
  if (Array.isArray(value)) return value.map((v) => headerText(v)).join(', ')
  const fields = value as { text?: unknown; value?: unknown; params?: unknown }
  if (typeof fields.text === 'string') return fields.text
  if (typeof fields.value === 'string' && fields.params && typeof fields.params === 'object') {
    const params = Object.entries(fields.params as Record<string, string>).map(([k, v]) => `; ${k}=${v}`)
    return fields.value + params.join('')
  }
  // List-* headers, combined by the parser into one object.
  return JSON.stringify(value)
}

function headersOf(parsed: ParsedMail): Record<string, string> {
  return Object.fromEntries([...parsed.headers.entries()].map(([key, value]) => [key, headerText(value)]))
}

function organizationOf(headers: Record<string, string>): number | null {
  const id = Number(headers[ORGANIZATION_HEADER])
  return Number.isSafeInteger(id) && id > 0 ? id : null
}

async function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
  const chunks: Buffer[] = []
  for await (const chunk of stream) chunks.push(chunk as Buffer)
  return Buffer.concat(chunks)
}

/**
 * A local SMTP server for development and tests: plain SMTP on loopback, no TLS, any or no
 * credentials, and every message it accepts stored in `fake_mailbox`. It answers 250 only after
 * the row is written, so a message the sender counts as sent is in the mailbox.
 * Stopping and starting again on the same port is how tests simulate a mail server outage.
 */
export async function startFakeSmtp(ctx: Pick<AppContext, 'models' | 'logger'>, options: { host?: string; port: number }): Promise<FakeSmtp> {
  const store = async (stream: SMTPServerDataStream, session: SMTPServerSession) => {
    const raw = await readAll(stream)
    if (stream.sizeExceeded) {
      throw Object.assign(new Error('Message exceeds fixed maximum message size'), { responseCode: 552 })
    }
    const parsed = await simpleParser(raw)
    const headers = headersOf(parsed)
    const attachments: ReceivedAttachment[] = parsed.attachments.map((a) => ({
      filename: a.filename ?? null,
      contentType: a.contentType,
      size: a.size,
      cid: a.cid ?? null,
    }))
    const row = await ctx.models.FakeMailboxMessage.create({
      organizationId: organizationOf(headers),
      envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
      envelopeTo: session.envelope.rcptTo.map((r) => r.address),
      subject: parsed.subject ?? null,
      textBody: parsed.text ?? null,
      htmlBody: parsed.html || null,
      headers,
      attachments,
      rawSize: raw.length,
    })
    return row.id
  }

  const server = new SMTPServer({
    name: 'tankwarden-fake-smtp',
    banner: 'Tankwarden local mail server (development only)',
    secure: false,
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    allowInsecureAuth: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    // Short, so a stop in a test does not wait half a minute for a client that went quiet.
    closeTimeout: 1500,
    onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? 'anonymous' }),
    onData: (stream, session, callback) => {
      store(stream, session).then(
        (id) => callback(null, `Stored as ${id}`),
        (error: Error & { responseCode?: number }) => {
          ctx.logger.warn({ err: error }, 'fake SMTP could not store a message')
          // 451: a temporary failure, the sender keeps the mail and tries again.
          callback(Object.assign(new Error(error.message), { responseCode: error.responseCode ?? 451 }))
        },
      )
    },
  })
  server.on('error', (error) => ctx.logger.warn({ err: error }, 'fake SMTP error'))

  const host = options.host ?? '127.0.0.1'
  await new Promise<void>((resolve, reject) => {
    server.server.once('error', reject)
    server.listen(options.port, host, () => {
      server.server.off('error', reject)
      resolve()
    })
  })
  const address = server.server.address()
  const port = typeof address === 'object' && address ? address.port : options.port
  let running = true
  let stopping: Promise<void> | null = null

  return {
    port,
    isRunning: () => running,
    stop() {
      stopping ??= new Promise<void>((resolve) => {
        running = false
        server.close(() => resolve())
      })
      return stopping
    },
  }
}
