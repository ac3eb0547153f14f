import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { enqueueMail } from '../../server/mail/outbox'
import { startOutboxSender } from '../../server/mail/sender'
import { createMailTransport } from '../../server/mail/transport'
import { sampleMail, startMailBed, type MailBed } from './mail-bed'
import { waitFor } from '../helpers/wait'

let bed: MailBed
beforeAll(async () => {
  bed = await startMailBed()
})
afterEach(async () => {
  if (!bed.fake.isRunning()) await bed.restartSmtp()
  await bed.ctx.sequelize.query('TRUNCATE mail_outbox, fake_mailbox')
})
afterAll(async () => {
  await bed?.close()
})

async function enqueueMany(count: number, prefix: string) {
  const subjects = Array.from({ length: count }, (_, i) => `${prefix} ${String(i).padStart(3, '0')}`)
  for (const subject of subjects) await enqueueMail(bed.ctx, sampleMail({ subject }))
  return subjects
}

const subjectsReceived = async () => (await bed.mailbox()).map((m) => m.subject).sort()

describe('several senders on one outbox', () => {
  it('two senders racing over the same rows send each mail once', async () => {
    const subjects = await enqueueMany(40, 'Race')
    const second = createMailTransport(bed.ctx.config, { fakeSmtpPort: bed.fake.port })
    const a = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true, batch: 5 })
    const b = startOutboxSender(bed.ctx, { transport: second, manual: true, batch: 5 })
    const results = []
    for (let round = 0; round < 8; round++) results.push(...(await Promise.all([a.runOnce(), b.runOnce()])))
    await Promise.all([a.stop(), b.stop()])
    second.close()

    const claimedA = results.filter((_, i) => i % 2 === 0).reduce((sum, r) => sum + r.claimed, 0)
    const claimedB = results.filter((_, i) => i % 2 === 1).reduce((sum, r) => sum + r.claimed, 0)
    expect(claimedA + claimedB).toBe(40)
    expect(claimedA).toBeGreaterThan(0)
    expect(claimedB).toBeGreaterThan(0)
    expect(await subjectsReceived()).toEqual(subjects)
    expect((await bed.outbox()).every((r) => r.status === 'sent' && r.attempts === 1)).toBe(true)
  })

  it('an SMTP outage in the middle of a run: after the restart every mail has arrived exactly once', async () => {
    const subjects = await enqueueMany(30, 'Outage')
    const retry = { baseMs: 100, maxMs: 200 }
    const a = startOutboxSender(bed.ctx, { transport: bed.transport, pollMs: 20, batch: 3, retry })
    const second = createMailTransport(bed.ctx.config, { fakeSmtpPort: bed.fake.port })
    const b = startOutboxSender(bed.ctx, { transport: second, pollMs: 20, batch: 3, retry })

    await waitFor(
      () => bed.mailbox(),
      (rows) => rows.length >= 5,
    )
    await bed.stopSmtp()
    // Attempts fail while the server is away; the failed rows wait and are retried.
    await waitFor(
      () => bed.outbox(),
      (rows) => rows.some((r) => r.status === 'pending' && r.attempts > 0),
    )
    const whileDown = (await bed.mailbox()).length
    expect(whileDown).toBeLessThan(30)
    await bed.restartSmtp()

    await waitFor(
      () => bed.outbox(),
      (rows) => rows.every((r) => r.status === 'sent'),
      15_000,
    )
    await Promise.all([a.stop(), b.stop()])
    second.close()
    expect(await subjectsReceived()).toEqual(subjects)
    const retried = (await bed.outbox()).filter((r) => r.attempts > 1)
    expect(retried.length).toBeGreaterThan(0)
  })

  it('stopping a sender mid-batch hands the unsent rows back at once', async () => {
    await enqueueMany(6, 'Handed back')
    let stopping: Promise<void> | undefined
    // A transport that asks for the stop after the first delivery.
    const stopAfterFirst = {
      sendMail: async (m: Parameters<typeof bed.transport.sendMail>[0]) => {
        const info = await bed.transport.sendMail(m)
        stopping ??= sender.stop()
        return info
      },
      close: () => {},
    }
    const sender = startOutboxSender(bed.ctx, { transport: stopAfterFirst, manual: true, batch: 6 })
    const result = await sender.runOnce()
    await stopping
    expect(result).toEqual({ claimed: 6, sent: 1, retried: 0, failed: 0, released: 5 })
    expect((await bed.outbox()).map((r) => r.status)).toEqual(['sent', 'pending', 'pending', 'pending', 'pending', 'pending'])
    expect((await bed.outbox()).map((r) => r.attempts)).toEqual([1, 0, 0, 0, 0, 0])
  })
})
