import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, TEST_PASSWORD, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Account Mail Org')
})
afterAll(() => t.close())

const outbox = (to: string) =>
  t.ctx.sequelize.query<{ kind: string; subject: string; text_body: string; organization_id: number }>(
    'SELECT kind, subject, text_body, organization_id FROM mail_outbox WHERE to_address = $1 ORDER BY id',
    { bind: [to], type: QueryTypes.SELECT },
  )

describe('invitations and password resets go out through the mail outbox', () => {
  it('mails an invitation with the same link the owner sees', async () => {
    const res = await t
      .api()
      .post('/api/v1/users/invitations')
      .set(bearer(org.users.owner.token))
      .send({ email: 'new.keeper@mail.example', name: 'New Keeper', role: 'keeper' })
    expect(res.status).toBe(201)
    const [mail] = await outbox('new.keeper@mail.example')
    expect(mail).toMatchObject({ kind: 'invitation', organization_id: org.organizationId })
    expect(mail.subject).toMatch(/invites you to Account Mail Org/)
    expect(mail.text_body).toContain(res.body.link)
  })

  it('answers the same for a known and an unknown address, mails only the known one, and the link works once', async () => {
    const known = await t.api().post('/api/v1/auth/password-reset').send({ email: org.users.keeper.email })
    const unknown = await t.api().post('/api/v1/auth/password-reset').send({ email: 'nobody@nowhere.example' })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(known.body).toEqual(unknown.body)
    expect(await outbox('nobody@nowhere.example')).toEqual([])
    const [mail] = await outbox(org.users.keeper.email)
    expect(mail.kind).toBe('password_reset')
    const token = /reset-password\?token=([\w-]+)/.exec(mail.text_body)![1]

    const short = await t.api().post('/api/v1/auth/password-reset/confirm').send({ token, password: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.error.fields).toHaveProperty('password')
    expect((await t.api().post('/api/v1/auth/password-reset/confirm').send({ token, password: 'a-brand-new-password' })).status).toBe(204)
    // The old sessions end, the old password no longer works, the new one does.
    expect((await t.api().get('/api/v1/auth/me').set(bearer(org.users.keeper.token))).status).toBe(401)
    expect((await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.keeper.email, password: TEST_PASSWORD })).status).toBe(401)
    expect((await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.keeper.email, password: 'a-brand-new-password' })).status).toBe(200)
    const again = await t.api().post('/api/v1/auth/password-reset/confirm').send({ token, password: 'another-new-password' })
    expect(again.status).toBe(400)
    expect(again.body.error).toMatchObject({ code: 'invalid_input', fields: { token: 'already used' } })
    expect((await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.keeper.email, password: 'another-new-password' })).status).toBe(401)
    const made = await t
      .api()
      .post('/api/v1/auth/password-reset/confirm')
      .send({ token: 'x'.repeat(43), password: 'another-new-password' })
    expect(made.body.error).toMatchObject({ code: 'invalid_input', fields: { token: 'unknown' } })
  })

  it('refuses an expired link by name and leaves the password as it was', async () => {
    await t.api().post('/api/v1/auth/password-reset').send({ email: org.users.viewer.email })
    const [mail] = await outbox(org.users.viewer.email)
    const token = /reset-password\?token=([\w-]+)/.exec(mail.text_body)![1]
    await t.ctx.sequelize.query(`UPDATE password_resets SET expires_at = now() - interval '1 minute' WHERE user_id = $1`, { bind: [org.users.viewer.id] })
    const late = await t.api().post('/api/v1/auth/password-reset/confirm').send({ token, password: 'a-brand-new-password' })
    expect(late.status).toBe(400)
    expect(late.body.error).toMatchObject({ code: 'invalid_input', fields: { token: 'expired' } })
    expect(late.body.error.message).toContain('60 minutes')
    expect((await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.viewer.email, password: TEST_PASSWORD })).status).toBe(200)
  })
})
