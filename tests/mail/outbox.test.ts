import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { enqueueMail } from '../../server/mail/outbox'
import { sampleMail, startMailBed, type MailBed } from './mail-bed'

let bed: MailBed
beforeAll(async () => {
  bed = await startMailBed()
})
afterAll(async () => {
  await bed?.close()
})

describe('enqueueMail', () => {
  it('stores a pending row that is due now, with attachments and links to organization and incident', async () => {
    const org = await bed.ctx.models.Organization.create({ name: 'Outbox org' })
    const id = await enqueueMail(
      bed.ctx,
      sampleMail({
        subject: 'Alarm: temperature',
        organizationId: org.id,
        incidentId: 4242,
        attachments: [{ filename: 'trend.png', cid: 'trend@tankwarden', contentType: 'image/png', base64: 'iVBORw0KGgo=' }],
      }),
    )
    expect(id).toBeGreaterThan(0)
    const row = await bed.ctx.models.OutboxMessage.findByPk(id!)
    expect(row).toMatchObject({ status: 'pending', attempts: 0, organizationId: org.id, incidentId: 4242, subject: 'Alarm: temperature', lastError: null })
    expect(row!.attachments).toEqual([{ filename: 'trend.png', cid: 'trend@tankwarden', contentType: 'image/png', base64: 'iVBORw0KGgo=' }])
    expect(Math.abs(row!.nextAttemptAt.getTime() - Date.now())).toBeLessThan(5000)
  })

  it('enqueues the same logical mail once: a second call with the dedupe key answers null', async () => {
    const mail = sampleMail({ dedupeKey: 'incident:7:opened:user:3' })
    const first = await enqueueMail(bed.ctx, mail)
    const second = await enqueueMail(bed.ctx, { ...mail, subject: 'A different subject' })
    expect(first).toBeGreaterThan(0)
    expect(second).toBeNull()
    const rows = await bed.ctx.models.OutboxMessage.findAll({ where: { dedupeKey: 'incident:7:opened:user:3' } })
    expect(rows.map((r) => r.subject)).toEqual([mail.subject])
  })

  it('commits and rolls back with the caller’s transaction', async () => {
    const kept = sampleMail()
    const dropped = sampleMail()
    await bed.ctx.sequelize.transaction(async (transaction) => {
      await enqueueMail(bed.ctx, kept, { transaction })
    })
    await expect(
      bed.ctx.sequelize.transaction(async (transaction) => {
        await enqueueMail(bed.ctx, dropped, { transaction })
        throw new Error('the incident could not be stored')
      }),
    ).rejects.toThrow('the incident could not be stored')
    expect(await bed.ctx.models.OutboxMessage.count({ where: { dedupeKey: kept.dedupeKey } })).toBe(1)
    expect(await bed.ctx.models.OutboxMessage.count({ where: { dedupeKey: dropped.dedupeKey } })).toBe(0)
  })

  it('holds a mail back until notBefore', async () => {
    const notBefore = new Date(Date.now() + 3_600_000)
    const id = await enqueueMail(bed.ctx, sampleMail({ kind: 'snooze_ending', notBefore }))
    const row = await bed.ctx.models.OutboxMessage.findByPk(id!)
    expect(row!.nextAttemptAt.getTime()).toBe(notBefore.getTime())
  })

  it('flattens a subject to one line so it cannot add a header', async () => {
    const id = await enqueueMail(bed.ctx, sampleMail({ subject: 'Tank A\r\nBcc: someone@else.example' }))
    expect((await bed.ctx.models.OutboxMessage.findByPk(id!))!.subject).toBe('Tank A Bcc: someone@else.example')
  })

  it('rejects an unknown kind, a bad address and non-base64 attachments', async () => {
    await expect(enqueueMail(bed.ctx, sampleMail({ kind: 'newsletter' as never }))).rejects.toThrow()
    await expect(enqueueMail(bed.ctx, sampleMail({ to: 'not an address' }))).rejects.toThrow()
    await expect(enqueueMail(bed.ctx, sampleMail({ attachments: [{ filename: 'x.png', contentType: 'image/png', base64: 'not base64!' }] }))).rejects.toThrow()
  })
})
