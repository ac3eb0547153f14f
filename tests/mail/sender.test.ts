import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { EventMap } from '../../server/platform/events'
import { enqueueMail } from '../../server/mail/outbox'
import { DEFAULT_RETRY, retryDelayMs, startOutboxSender } from '../../server/mail/sender'
import type { MailTransport } from '../../server/mail/transport'
import { sampleMail, startMailBed, type MailBed } from './mail-bed'
import { waitFor } from '../helpers/wait'

type Attempt = EventMap['mail.attempted'][0]
let bed: MailBed
const attempts: Attempt[] = []
const record = (a: Attempt) => void attempts.push(a)

beforeAll(async () => {
  bed = await startMailBed()
  bed.ctx.events.on('mail.attempted', record)
})
afterEach(async () => {
  attempts.length = 0
  if (!bed.fake.isRunning()) await bed.restartSmtp()
  await bed.ctx.sequelize.query('TRUNCATE mail_outbox, fake_mailbox')
})
afterAll(async () => {
  await bed?.close()
})

// A 1-pixel PNG, so the attachment arrives as real image data.
const PIXEL_PNG = 'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg=='

describe('retry delay', () => {
  it('doubles from 15 s and stops at 5 min', () => {
    expect([1, 2, 3, 4, 5, 6, 10].map((n) => retryDelayMs(n))).toEqual([15_000, 30_000, 60_000, 120_000, 240_000, 300_000, 300_000])
    expect(DEFAULT_RETRY.maxAttempts).toBe(100)
  })
})

describe('outbox sender over real SMTP', () => {
  it('delivers a mail with its HTML and inline attachment into the fake mailbox and marks it sent', async () => {
    const org = await bed.ctx.models.Organization.create({ name: 'Sender org' })
    const id = await enqueueMail(
      bed.ctx,
      sampleMail({
        to: 'Night.Keeper@Shop.example',
        subject: 'Alarm: temperature 31.4 °C on Reef 2',
        text: 'Temperature is 31.4 °C',
        html: '<p>Temperature is 31.4 °C</p><img src="cid:trend@tankwarden">',
        organizationId: org.id,
        incidentId: 77,
        attachments: [{ filename: 'trend.png', cid: 'trend@tankwarden', contentType: 'image/png', base64: PIXEL_PNG }],
      }),
    )
    const sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true })
    const result = await sender.runOnce()
    await sender.stop()
    expect(result).toEqual({ claimed: 1, sent: 1, retried: 0, failed: 0, released: 0 })

    const [received] = await bed.mailbox()
    // The domain part of an address is case-insensitive; nodemailer lowercases it, the local part stays.
    expect(received).toMatchObject({
      subject: 'Alarm: temperature 31.4 °C on Reef 2',
      envelope_from: 'alerts@tankwarden.invalid',
      envelope_to: ['Night.Keeper@shop.example'],
      organization_id: org.id,
    })
    expect(received!.text_body?.trim()).toBe('Temperature is 31.4 °C')
    expect(received!.attachments).toEqual([
      { filename: 'trend.png', contentType: 'image/png', size: Buffer.from(PIXEL_PNG, 'base64').length, cid: 'trend@tankwarden' },
    ])
    expect(received!.headers['auto-submitted']).toBe('auto-generated')
    // mailparser quotes the display name when it formats the address back to text.
    expect(received!.headers.from).toBe('"Tankwarden" <alerts@tankwarden.invalid>')
    expect(received!.headers['x-tankwarden-kind']).toBe('incident_opened')

    const [row] = await bed.outbox()
    expect(row).toMatchObject({ id, status: 'sent', attempts: 1, last_error: null })
    expect(row!.smtp_message_id).toMatch(new RegExp(`^<outbox-${id}\\.\\d+@tankwarden\\.invalid>$`))
    expect(received!.headers['message-id']).toBe(row!.smtp_message_id)
    expect(attempts).toEqual([{ outboxId: id, incidentId: 77, kind: 'incident_opened', to: 'Night.Keeper@Shop.example', ok: true }])
  })

  it('keeps mails while SMTP is down, counts attempts with backoff, then delivers each exactly once', async () => {
    await bed.stopSmtp()
    const ids = [] as number[]
    for (let i = 0; i < 3; i++) ids.push((await enqueueMail(bed.ctx, sampleMail({ subject: `Queued while down ${i}` })))!)
    const sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true, retry: { baseMs: 60_000, maxMs: 600_000 } })

    expect(await sender.runOnce()).toMatchObject({ claimed: 3, sent: 0, retried: 3 })
    let rows = await bed.outbox()
    expect(rows.map((r) => [r.status, r.attempts])).toEqual([
      ['pending', 1],
      ['pending', 1],
      ['pending', 1],
    ])
    expect(rows.every((r) => r.last_error && r.last_error.length > 0)).toBe(true)
    // First failure waits baseMs (60 s here): nothing is due, the next run claims nothing.
    for (const r of rows) expect(r.next_attempt_at.getTime() - Date.now()).toBeGreaterThan(50_000)
    expect((await sender.runOnce()).claimed).toBe(0)

    await bed.makeDue()
    await sender.runOnce()
    rows = await bed.outbox()
    expect(rows.map((r) => r.attempts)).toEqual([2, 2, 2])
    // Second failure waits 2 × baseMs.
    for (const r of rows) expect(r.next_attempt_at.getTime() - Date.now()).toBeGreaterThan(110_000)
    expect(await bed.mailbox()).toEqual([])
    expect(attempts.filter((a) => !a.ok)).toHaveLength(6)

    await bed.restartSmtp()
    await bed.makeDue()
    expect(await sender.runOnce()).toMatchObject({ claimed: 3, sent: 3 })
    expect(await sender.runOnce()).toMatchObject({ claimed: 0 })
    await sender.stop()
    const received = await bed.mailbox()
    expect(received.map((m) => m.subject).sort()).toEqual(['Queued while down 0', 'Queued while down 1', 'Queued while down 2'])
    expect((await bed.outbox()).map((r) => [r.id, r.status, r.attempts])).toEqual(ids.map((id) => [id, 'sent', 3]))
  })

  it('gives up after maxAttempts and marks the row failed', async () => {
    const broken: MailTransport = { sendMail: async () => Promise.reject(new Error('550 mailbox unavailable')), close: () => {} }
    const id = await enqueueMail(bed.ctx, sampleMail())
    const sender = startOutboxSender(bed.ctx, { transport: broken, manual: true, retry: { baseMs: 1, maxMs: 1, maxAttempts: 3 } })
    for (let i = 0; i < 3; i++) {
      await bed.makeDue()
      await sender.runOnce()
    }
    await bed.makeDue()
    expect((await sender.runOnce()).claimed).toBe(0)
    await sender.stop()
    const [row] = await bed.outbox()
    expect(row).toMatchObject({ id, status: 'failed', attempts: 3, last_error: '550 mailbox unavailable' })
    expect(attempts.map((a) => a.error)).toEqual(['550 mailbox unavailable', '550 mailbox unavailable', '550 mailbox unavailable'])
  })

  it('returns a row stuck in sending (its instance died) to the queue after the stale limit', async () => {
    const id = (await enqueueMail(bed.ctx, sampleMail({ subject: 'Left mid-send' })))!
    await bed.ctx.sequelize.query(`UPDATE mail_outbox SET status = 'sending', updated_at = now() - interval '3 minutes' WHERE id = $1`, { bind: [id] })
    const fresh = (await enqueueMail(bed.ctx, sampleMail({ subject: 'Just claimed elsewhere' })))!
    await bed.ctx.sequelize.query(`UPDATE mail_outbox SET status = 'sending', updated_at = now() - interval '30 seconds' WHERE id = $1`, { bind: [fresh] })

    const sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true })
    expect(await sender.runOnce()).toMatchObject({ claimed: 1, sent: 1 })
    await sender.stop()
    expect((await bed.outbox()).map((r) => [r.id, r.status])).toEqual([
      [id, 'sent'],
      [fresh, 'sending'],
    ])
    expect((await bed.mailbox()).map((m) => m.subject)).toEqual(['Left mid-send'])
  })

  it('polls on its own and sends what is enqueued later', async () => {
    const sender = startOutboxSender(bed.ctx, { transport: bed.transport, pollMs: 50 })
    await enqueueMail(bed.ctx, sampleMail({ subject: 'Found by polling' }))
    const received = await waitFor(
      () => bed.mailbox(),
      (rows) => rows.length === 1,
    )
    await sender.stop()
    expect(received[0]!.subject).toBe('Found by polling')
  })
})
