import { generateKeyPairSync, randomUUID } from 'node:crypto'
import jwt from 'jsonwebtoken'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { TEST_PASSWORD, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { until } from '../helpers/wait'

// JWT forgery beyond the route matrix, brute-force limits beyond the basic case, and markup in names
// through the real mail path. Already covered, not repeated: a flipped signature bit, alg `none`
// and an expired token on every route (tests/api/route-roles.test.ts); the sixth wrong password in
// the window answering 429 with Retry-After (tests/api/auth.test.ts); template-level escaping of
// every mail (tests/mail/templates.test.ts).

const JWT_SECRET = 'test-secret-that-is-long-enough-for-hs256-signing'
const SIGN_IN_LIMIT = 5
const MARKUP = '<img src=x onerror=window.__x=1>'

let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg

beforeAll(async () => {
  s = await startTestServer({ signInLimit: SIGN_IN_LIMIT, mail: { fakeSmtpPort: 0, from: 'security@tankwarden.invalid' } })
  org = await s.createOrg('Marrowfen Tokens')
})
afterAll(() => s?.close())

const call = (method: string, path: string, token?: string, body?: unknown) =>
  fetch(`${s.baseUrl}/api/v1${path}`, {
    method,
    headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  })

/** The claims of a live session of the owner, so a forged token fails on its forgery alone. */
async function liveClaims() {
  const jti = randomUUID()
  await s.ctx.models.Session.create({ id: jti, userId: org.users.owner.id, expiresAt: new Date(Date.now() + 3600_000) })
  return { org: org.organizationId, typ: 'user', sub: String(org.users.owner.id), jti }
}
const b64 = (v: unknown) => Buffer.from(JSON.stringify(v)).toString('base64url')

describe('forged and confused JWTs are refused', () => {
  it('the control: the same live claims signed with HS256 and the secret are accepted', async () => {
    const { sub, jti, ...rest } = await liveClaims()
    const token = jwt.sign(rest, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: 60 })
    expect((await call('GET', '/auth/me', token)).status).toBe(200)
  })

  it.each([
    [
      'RS256 with an attacker’s RSA key',
      async () => {
        const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 })
        const { sub, jti, ...rest } = await liveClaims()
        return jwt.sign(rest, privateKey, { algorithm: 'RS256', subject: sub, jwtid: jti, expiresIn: 60 })
      },
    ],
    [
      'HS256 keyed with an RSA public key (the RS→HS swap)',
      async () => {
        const { publicKey } = generateKeyPairSync('rsa', { modulusLength: 2048 })
        const pem = publicKey.export({ type: 'spki', format: 'pem' }).toString()
        const claims = await liveClaims()
        const header = b64({ alg: 'HS256', typ: 'JWT' })
        const body = b64({ ...claims, iat: Math.floor(Date.now() / 1000), exp: Math.floor(Date.now() / 1000) + 60 })
        const { createHmac } = await import('node:crypto')
        return `${header}.${body}.${createHmac('sha256', pem).update(`${header}.${body}`).digest('base64url')}`
      },
    ],
    [
      'HS512 with the real secret (only HS256 is allowed)',
      async () => {
        const { sub, jti, ...rest } = await liveClaims()
        return jwt.sign(rest, JWT_SECRET, { algorithm: 'HS512', subject: sub, jwtid: jti, expiresIn: 60 })
      },
    ],
    [
      'HS384 with the real secret',
      async () => {
        const { sub, jti, ...rest } = await liveClaims()
        return jwt.sign(rest, JWT_SECRET, { algorithm: 'HS384', subject: sub, jwtid: jti, expiresIn: 60 })
      },
    ],
    [
      'alg "None" in other casing, no signature',
      async () => {
        const now = Math.floor(Date.now() / 1000)
        return `${b64({ alg: 'None', typ: 'JWT' })}.${b64({ ...(await liveClaims()), iat: now, exp: now + 60 })}.`
      },
    ],
    [
      'alg "none" keeping a genuine signature',
      async () => {
        const { sub, jti, ...rest } = await liveClaims()
        const genuine = jwt.sign(rest, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: 60 })
        const [, payload, signature] = genuine.split('.')
        return `${b64({ alg: 'none', typ: 'JWT' })}.${payload}.${signature}`
      },
    ],
    [
      'a kid and jku header pointing elsewhere, signed with another secret',
      async () => {
        const { sub, jti, ...rest } = await liveClaims()
        return jwt.sign(rest, 'attacker-secret-attacker-secret-attacker', {
          algorithm: 'HS256',
          subject: sub,
          jwtid: jti,
          expiresIn: 60,
          keyid: '../../dev/null',
          header: { alg: 'HS256', jku: 'http://attacker.invalid/jwks' } as never,
        })
      },
    ],
    [
      'genuine signature, but a wall token’s type',
      async () => {
        const { sub, jti, org: o } = await liveClaims()
        return jwt.sign({ org: o, typ: 'wall' }, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: 60 })
      },
    ],
    [
      'genuine signature, but a session id that is not a session',
      async () => {
        const { sub, org: o } = await liveClaims()
        return jwt.sign({ org: o, typ: 'user' }, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: "' OR 1=1 --", expiresIn: 60 })
      },
    ],
    [
      'genuine signature, not valid yet (nbf an hour ahead)',
      async () => {
        const { sub, jti, ...rest } = await liveClaims()
        return jwt.sign(rest, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: 7200, notBefore: 3600 })
      },
    ],
  ] as const)('%s → 401', async (_name, forge) => {
    const token = await forge()
    const res = await call('GET', '/auth/me', token)
    expect(res.status).toBe(401)
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('unauthenticated')
  })
})

describe('sign-in brute force is slowed', () => {
  it('once limited, even the right password answers 429, so the limit reveals nothing', async () => {
    const email = org.users.viewer.email
    for (let i = 0; i < SIGN_IN_LIMIT; i++) expect((await call('POST', '/auth/sign-in', undefined, { email, password: `wrong-${i}` })).status).toBe(401)
    const right = await call('POST', '/auth/sign-in', undefined, { email, password: TEST_PASSWORD })
    expect(right.status).toBe(429)
    expect(Number(right.headers.get('retry-after'))).toBeGreaterThan(0)
  })

  it('changing the case or padding the address with spaces does not open a fresh allowance', async () => {
    const email = 'spaced@tokens.example'
    for (let i = 0; i < SIGN_IN_LIMIT; i++) await call('POST', '/auth/sign-in', undefined, { email, password: `wrong-${i}` })
    for (const variant of [email.toUpperCase(), ` ${email}`, `${email} `, `\t${email.toUpperCase()}\n`]) {
      const res = await call('POST', '/auth/sign-in', undefined, { email: variant, password: 'another-guess' })
      expect(res.status, JSON.stringify(variant)).toBe(429)
    }
  })

  it('password reset requests are limited the same way', async () => {
    const email = 'reset-flood@tokens.example'
    for (let i = 0; i < SIGN_IN_LIMIT; i++) expect((await call('POST', '/auth/password-reset', undefined, { email })).status).toBe(202)
    const blocked = await call('POST', '/auth/password-reset', undefined, { email })
    expect(blocked.status).toBe(429)
    expect(Number(blocked.headers.get('retry-after'))).toBeGreaterThan(0)
  })
})

describe('markup in names reaches mail only escaped', () => {
  it('an invitation from an owner and to an invitee with markup in their names', async () => {
    expect((await call('PATCH', `/users/${org.users.owner.id}`, org.users.owner.token, { name: `Owner ${MARKUP}` })).status).toBe(200)
    const invitee = 'markup-invitee@tokens.example'
    const res = await call('POST', '/users/invitations', org.users.owner.token, { email: invitee, name: `Invitee ${MARKUP}`, role: 'keeper' })
    expect(res.status).toBe(201)
    let mail: { htmlBody: string | null } | null = null
    await until(async () => {
      const rows = await s.ctx.models.FakeMailboxMessage.findAll()
      mail = rows.find((m) => m.envelopeTo.includes(invitee)) ?? null
      return mail !== null
    }, 15_000)
    expect(mail, 'the invitation mail arrived at the fake SMTP server').not.toBeNull()
    expect(mail!.htmlBody).toBeTruthy()
    expect(mail!.htmlBody).not.toContain('<img src=x')
    expect(mail!.htmlBody).toContain('&lt;img src=x onerror=window.__x=1&gt;')
  })
})
