import type { AppContext } from '../context'
import { startFakeSmtp, type FakeSmtp } from './fake-smtp'
import { startOutboxSender, type OutboxSender, type SenderOptions } from './sender'
import { createMailTransport } from './transport'

export { enqueueMail, type OutgoingMail } from './outbox'
export { startOutboxSender, retryDelayMs, DEFAULT_RETRY, type RetryPolicy, type OutboxSender, type RunResult, type SenderOptions } from './sender'
export { createMailTransport, type MailTransport } from './transport'
export { startFakeSmtp, type FakeSmtp } from './fake-smtp'
export { renderTrendPng, renderTrendSvg, type TrendChartInput } from './trend-chart'
export * from './templates'
export * from './types'
export { careDigest, type DigestTank, type DigestTask } from './care-digest'

export type RunningMail = {
  /** The local fake server, when no SMTP_URL is configured (then the dev mailbox may be mounted). */
  fakeSmtp: FakeSmtp | null
  sender: OutboxSender
  stop: () => Promise<void>
}

/**
 * Starts mail for one instance: the local fake SMTP server unless SMTP_URL is set, and the
 * outbox sender. Several instances may each run a sender; the outbox hands each row to one.
 * With several instances and no SMTP_URL, give each its own FAKE_SMTP_PORT.
 */
export async function startMail(ctx: AppContext, options: Omit<SenderOptions, 'transport'> = {}): Promise<RunningMail> {
  const { config, logger } = ctx
  let fakeSmtp: FakeSmtp | null = null
  if (!config.mail.smtpUrl) {
    fakeSmtp = await startFakeSmtp(ctx, { host: '127.0.0.1', port: config.mail.fakeSmtpPort })
    const note = config.env === 'production' ? 'SMTP_URL is not set: mail goes to the local fake mailbox only' : 'local fake mail server'
    logger[config.env === 'production' ? 'warn' : 'info']({ port: fakeSmtp.port }, note)
  }
  const transport = createMailTransport(config, { fakeSmtpPort: fakeSmtp?.port })
  const sender = startOutboxSender(ctx, { ...options, transport })
  let stopped = false
  return {
    fakeSmtp,
    sender,
    async stop() {
      if (stopped) return
      stopped = true
      await sender.stop()
      transport.close()
      await fakeSmtp?.stop()
    },
  }
}
