import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, TEST_PASSWORD, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp({ signInLimit: 5 })
  org = await t.createOrg('Auth Org')
})
afterAll(() => t.close())

describe('sign-in', () => {
  it('answers a token, the user and the organization for the right password', async () => {
    const res = await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.keeper.email, password: TEST_PASSWORD })
    expect(res.status).toBe(200)
    expect(res.body.user).toMatchObject({ email: org.users.keeper.email, role: 'keeper', active: true })
    expect(res.body.organization.name).toBe('Auth Org')
    expect(res.body.user).not.toHaveProperty('passwordHash')
    const me = await t.api().get('/api/v1/auth/me').set(bearer(res.body.token))
    expect(me.status).toBe(200)
    expect(me.body.user.id).toBe(org.users.keeper.id)
  })

  it('answers the same for an unknown e-mail and a wrong password', async () => {
    const unknown = await t.api().post('/api/v1/auth/sign-in').send({ email: 'nobody@nowhere.example', password: 'x' })
    const wrong = await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.viewer.email, password: 'wrong-one' })
    expect(unknown.status).toBe(401)
    expect(wrong.status).toBe(401)
    expect(unknown.body).toEqual(wrong.body)
    expect(wrong.body.error.code).toBe('bad_credentials')
  })

  it('names the field for a malformed body', async () => {
    const res = await t.api().post('/api/v1/auth/sign-in').send({ email: 'not-an-email' })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('email')
    expect(res.body.error.fields).toHaveProperty('password')
  })

  it('rejects malformed JSON with 400 and an oversized body with 413', async () => {
    const bad = await t.api().post('/api/v1/auth/sign-in').set('Content-Type', 'application/json').send('{"email":')
    expect(bad.status).toBe(400)
    expect(bad.body.error.code).toBe('invalid_json')
    const big = await t
      .api()
      .post('/api/v1/auth/sign-in')
      .send({ email: 'a@b.example', password: 'x'.repeat(2_000_000) })
    expect(big.status).toBe(413)
    expect(big.body.error.code).toBe('too_large')
  })

  it('slows brute force: the sixth attempt in the window is 429 with a retry time', async () => {
    const email = 'target@limit.example'
    for (let i = 0; i < 5; i++) {
      const res = await t
        .api()
        .post('/api/v1/auth/sign-in')
        .send({ email, password: `guess-${i}` })
      expect(res.status).toBe(401)
    }
    const blocked = await t.api().post('/api/v1/auth/sign-in').send({ email, password: 'guess-6' })
    expect(blocked.status).toBe(429)
    expect(blocked.body.error.code).toBe('rate_limited')
    expect(blocked.body.error.retryAfterSeconds).toBeGreaterThan(0)
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0)
  })
})

describe('sessions', () => {
  it('sign-out revokes the token', async () => {
    const signIn = await t.api().post('/api/v1/auth/sign-in').send({ email: org.users.owner.email, password: TEST_PASSWORD })
    const token = signIn.body.token
    expect((await t.api().post('/api/v1/auth/sign-out').set(bearer(token))).status).toBe(204)
    const after = await t.api().get('/api/v1/auth/me').set(bearer(token))
    expect(after.status).toBe(401)
    expect(after.body.error.code).toBe('unauthenticated')
  })

  it('change password needs the current one and then accepts the new one', async () => {
    const other = await t.createOrg('Password Org')
    const token = other.users.keeper.token
    const wrong = await t.api().post('/api/v1/auth/password').set(bearer(token)).send({ currentPassword: 'nope', newPassword: 'a-new-long-password' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.error.fields).toHaveProperty('currentPassword')
    const short = await t.api().post('/api/v1/auth/password').set(bearer(token)).send({ currentPassword: TEST_PASSWORD, newPassword: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.error.fields).toHaveProperty('newPassword')
    const ok = await t.api().post('/api/v1/auth/password').set(bearer(token)).send({ currentPassword: TEST_PASSWORD, newPassword: 'a-new-long-password' })
    expect(ok.status).toBe(204)
    const signIn = await t.api().post('/api/v1/auth/sign-in').send({ email: other.users.keeper.email, password: 'a-new-long-password' })
    expect(signIn.status).toBe(200)
  })
})
