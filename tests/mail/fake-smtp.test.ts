import nodemailer from 'nodemailer'
import request from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createApp } from '../../server/app'
import { startMail } from '../../server/mail'
import { enqueueMail } from '../../server/mail/outbox'
import { startOutboxSender } from '../../server/mail/sender'
import { createOrgIn, type TestOrg } from '../helpers/fixtures'
import { sampleMail, startMailBed, type MailBed } from './mail-bed'
import { waitFor } from '../helpers/wait'

let bed: MailBed
beforeAll(async () => {
  bed = await startMailBed()
})
afterAll(async () => {
  await bed?.close()
})

const bearer = (token: string) => ({ Authorization: `Bearer ${token}` })

describe('fake SMTP server', () => {
  it('stops (connections refused) and starts again on the same port', async () => {
    const port = bed.fake.port
    expect(port).toBeGreaterThan(0)
    await bed.stopSmtp()
    expect(bed.fake.isRunning()).toBe(false)
    await expect(bed.transport.sendMail({ to: 'a@shop.example', subject: 'while down', text: 'x' })).rejects.toMatchObject({ code: 'ESOCKET' })
    await bed.restartSmtp()
    expect([bed.fake.port, bed.fake.isRunning()]).toEqual([port, true])
    const info = await bed.transport.sendMail({ to: 'a@shop.example', subject: 'after restart', text: 'x' })
    expect(info.messageId).toMatch(/^<.+>$/)
    expect((await bed.mailbox()).map((m) => m.subject)).toContain('after restart')
  })

  it('refuses a message over the size limit (10 MiB) with a permanent error', async () => {
    const big = 'x'.repeat(11 * 1024 * 1024)
    await expect(bed.transport.sendMail({ to: 'a@shop.example', subject: 'too big', text: big })).rejects.toMatchObject({ responseCode: 552 })
    expect((await bed.mailbox()).map((m) => m.subject)).not.toContain('too big')
  })

  it('accepts a client that authenticates (any credentials) over plain SMTP', async () => {
    const authed = nodemailer.createTransport({ host: '127.0.0.1', port: bed.fake.port, secure: false, ignoreTLS: true, auth: { user: 'dev', pass: 'dev' } })
    await authed.sendMail({ from: 'dev@tankwarden.invalid', to: 'b@shop.example', subject: 'with auth', text: 'y' })
    authed.close()
    expect((await bed.mailbox()).find((m) => m.subject === 'with auth')?.envelope_to).toEqual(['b@shop.example'])
  })
})

describe('development mailbox routes', () => {
  let orgA: TestOrg
  let orgB: TestOrg
  let api: () => ReturnType<typeof request>

  beforeAll(async () => {
    await bed.ctx.sequelize.query('TRUNCATE fake_mailbox')
    orgA = await createOrgIn(bed.ctx, 'Mailbox A')
    orgB = await createOrgIn(bed.ctx, 'Mailbox B')
    const app = createApp(bed.ctx)
    api = () => request(app)

    await enqueueMail(bed.ctx, sampleMail({ subject: 'Alarm for A', organizationId: orgA.organizationId, html: '<p>A</p>' }))
    await enqueueMail(bed.ctx, sampleMail({ subject: 'Alarm for B', organizationId: orgB.organizationId }))
    // No organization on the row: visible only to the organization of the recipient.
    await enqueueMail(bed.ctx, sampleMail({ kind: 'password_reset', subject: 'Reset for A keeper', to: orgA.users.keeper.email }))
    const sender = startOutboxSender(bed.ctx, { transport: bed.transport, manual: true })
    await sender.runOnce()
    await sender.stop()
  })

  it('lists an organization’s messages without bodies, newest first', async () => {
    const res = await api().get('/api/v1/dev/mail').set(bearer(orgA.users.owner.token))
    expect(res.status).toBe(200)
    expect(res.body.items.map((m: { subject: string }) => m.subject)).toEqual(['Reset for A keeper', 'Alarm for A'])
    expect(Object.keys(res.body.items[0]).sort()).toEqual([
      'attachments',
      'envelopeFrom',
      'envelopeTo',
      'id',
      'organizationId',
      'rawSize',
      'receivedAt',
      'subject',
    ])
    const resB = await api().get('/api/v1/dev/mail').set(bearer(orgB.users.owner.token))
    expect(resB.body.items.map((m: { subject: string }) => m.subject)).toEqual(['Alarm for B'])
  })

  it('shows one message with its text and HTML; another organization’s is a 404', async () => {
    const list = await api().get('/api/v1/dev/mail').set(bearer(orgA.users.owner.token))
    const id = list.body.items.find((m: { subject: string }) => m.subject === 'Alarm for A').id
    const one = await api().get(`/api/v1/dev/mail/${id}`).set(bearer(orgA.users.owner.token))
    expect(one.status).toBe(200)
    expect(one.body.htmlBody).toContain('<p>A</p>')
    expect(one.body.textBody).toContain('Body of test mail')
    expect(one.body.headers['x-tankwarden-organization']).toBe(String(orgA.organizationId))
    const other = await api().get(`/api/v1/dev/mail/${id}`).set(bearer(orgB.users.owner.token))
    expect(other.status).toBe(404)
    expect((await api().get('/api/v1/dev/mail/abc').set(bearer(orgA.users.owner.token))).status).toBe(400)
    expect((await api().get('/api/v1/dev/mail')).status).toBe(401)
  })

  it('DELETE empties the organization’s box and leaves the others', async () => {
    const res = await api().delete('/api/v1/dev/mail').set(bearer(orgA.users.owner.token))
    expect(res.status).toBe(204)
    expect((await api().get('/api/v1/dev/mail').set(bearer(orgA.users.owner.token))).body.items).toEqual([])
    expect((await api().get('/api/v1/dev/mail').set(bearer(orgB.users.owner.token))).body.items).toHaveLength(1)
  })
})

describe('startMail', () => {
  it('starts the fake server and a polling sender, and stops both', async () => {
    const mail = await startMail(bed.ctx, { pollMs: 30 })
    expect(mail.fakeSmtp?.isRunning()).toBe(true)
    await enqueueMail(bed.ctx, sampleMail({ subject: 'Through startMail' }))
    await waitFor(
      () => bed.mailbox(),
      (rows) => rows.some((m) => m.subject === 'Through startMail'),
    )
    await mail.stop()
    expect(mail.fakeSmtp?.isRunning()).toBe(false)
  })
})
