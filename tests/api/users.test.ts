import { randomBytes } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, TEST_PASSWORD, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let owner: Record<string, string>
const NEW_PASSWORD = 'a-brand-new-password'
const GONE = 'This invitation is unknown, already used or expired'

const invite = (body: object, auth = owner) => t.api().post('/api/v1/users/invitations').set(auth).send(body)
const describeInvite = (token: string) => t.api().get(`/api/v1/invitations/${token}`)
const accept = (body: object) => t.api().post('/api/v1/invitations/accept').send(body)
const patchUser = (id: number, body: object, auth = owner) => t.api().patch(`/api/v1/users/${id}`).set(auth).send(body)
const signIn = (email: string, password: string) => t.api().post('/api/v1/auth/sign-in').send({ email, password })
const me = (token: string) => t.api().get('/api/v1/auth/me').set(bearer(token))
const tokenOf = (link: string) => new URL(link, 'http://localhost').searchParams.get('token')!

async function invited(body: object) {
  const res = await invite(body)
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return { ...res.body.invitation, token: tokenOf(res.body.link) }
}

beforeAll(async () => {
  t = await startTestApp({ signInLimit: 1000 })
  org = await t.createOrg('Users Org')
  owner = bearer(org.users.owner.token)
})
afterAll(() => t.close())

describe('invitation → description → acceptance', () => {
  it('a viewer limited to one site joins, signs in and sees only that site', async () => {
    const res = await invite({ email: ' Vera.Viewer@Example.COM', name: 'Vera', role: 'viewer', siteIds: [org.siteIds[0]] })
    expect(res.status).toBe(201)
    expect(res.body.link).toMatch(/^\/accept-invite\?token=[A-Za-z0-9_-]{43}$/)
    const inv = res.body.invitation
    expect(inv).toMatchObject({ email: 'vera.viewer@example.com', name: 'Vera', role: 'viewer', siteIds: [org.siteIds[0]] })
    const sevenDays = Date.parse(inv.expiresAt) - Date.parse(inv.createdAt)
    expect(Math.abs(sevenDays - 7 * 86_400_000)).toBeLessThan(5_000)
    const pending = await t.api().get('/api/v1/users/invitations').set(owner)
    expect(pending.body.map((i: { id: number }) => i.id)).toContain(inv.id)

    const token = tokenOf(res.body.link)
    const described = await describeInvite(token)
    expect(described.status).toBe(200)
    expect(described.body).toEqual({
      email: 'vera.viewer@example.com',
      name: 'Vera',
      role: 'viewer',
      organizationName: 'Users Org',
      expiresAt: inv.expiresAt,
    })

    const session = await accept({ token, password: NEW_PASSWORD, name: 'Vera V.' })
    expect(session.status).toBe(201)
    expect(session.body.user).toMatchObject({
      email: 'vera.viewer@example.com',
      name: 'Vera V.',
      role: 'viewer',
      active: true,
      siteIds: [org.siteIds[0]],
      organizationId: org.organizationId,
    })
    expect(session.body.organization).toEqual({ id: org.organizationId, name: 'Users Org', clockStyle: '24h' })
    expect((await me(session.body.token)).body.user.email).toBe('vera.viewer@example.com')
    const again = await signIn('vera.viewer@example.com', NEW_PASSWORD)
    expect(again.status).toBe(200)
    const sites = await t.api().get('/api/v1/sites').set(bearer(again.body.token))
    expect(sites.body.map((s: { id: number }) => s.id)).toEqual([org.siteIds[0]])
    const stillPending = await t.api().get('/api/v1/users/invitations').set(owner)
    expect(stillPending.body.map((i: { id: number }) => i.id)).not.toContain(inv.id)
  })

  it('a keeper invitation drops site limits, and the invitee’s name stays when none is given', async () => {
    const inv = await invited({ email: 'kai@users.example', name: 'Kai', role: 'keeper', siteIds: [org.siteIds[1]] })
    expect(inv.siteIds).toEqual([])
    const session = await accept({ token: inv.token, password: NEW_PASSWORD })
    expect(session.body.user).toMatchObject({ name: 'Kai', role: 'keeper', siteIds: [] })
  })

  it('a used, an expired and an unknown token answer 404', async () => {
    const used = await invited({ email: 'used@users.example', name: 'Used', role: 'keeper' })
    expect((await accept({ token: used.token, password: NEW_PASSWORD })).status).toBe(201)
    const expired = await invited({ email: 'late@users.example', name: 'Late', role: 'keeper' })
    await t.ctx.models.Invitation.update({ expiresAt: new Date(Date.now() - 1000) }, { where: { id: expired.id } })
    const unknown = randomBytes(32).toString('base64url')
    expect((await describeInvite(used.token.slice(0, 8))).body.error).toEqual({ code: 'not_found', message: GONE })
    for (const token of [used.token, expired.token, unknown]) {
      for (const res of [await describeInvite(token), await accept({ token, password: NEW_PASSWORD })]) {
        expect(res.status).toBe(404)
        expect(res.body.error).toEqual({ code: 'not_found', message: GONE })
      }
    }
    expect((await signIn('late@users.example', NEW_PASSWORD)).status).toBe(401)
    const pending = (await t.api().get('/api/v1/users/invitations').set(owner)).body.map((i: { id: number }) => i.id)
    expect(pending.filter((id: number) => id === used.id || id === expired.id)).toEqual([])
    const revokeUsed = await t.api().delete(`/api/v1/users/invitations/${used.id}`).set(owner)
    expect([revokeUsed.status, revokeUsed.body.error.message]).toEqual([404, 'Invitation not found'])
  })

  it('refuses an e-mail already in use, in any organization and any letter case: 409 email_taken', async () => {
    const stranger = await t.createOrg('Elsewhere')
    for (const email of [org.users.keeper.email, org.users.keeper.email.toUpperCase(), stranger.users.viewer.email]) {
      const res = await invite({ email, name: 'Twin', role: 'keeper' })
      expect(res.status).toBe(409)
      expect(res.body.error).toMatchObject({ code: 'email_taken', fields: { email: 'already in use' } })
    }
  })

  it('a second invitation to the same address cannot be accepted once the first was', async () => {
    const first = await invited({ email: 'twice@users.example', name: 'Twice', role: 'keeper' })
    const second = await invited({ email: 'twice@users.example', name: 'Twice', role: 'viewer' })
    expect((await accept({ token: first.token, password: NEW_PASSWORD })).status).toBe(201)
    const res = await accept({ token: second.token, password: NEW_PASSWORD })
    expect([res.status, res.body.error.code]).toEqual([409, 'email_taken'])
  })

  it('validates the invitation and the password with field names', async () => {
    const bad = await invite({ email: 'not-an-address', name: 'X', role: 'admin' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.fields.email).toBe('not an e-mail address')
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'role'])
    const inv = await invited({ email: 'short@users.example', name: 'Short', role: 'keeper' })
    const short = await accept({ token: inv.token, password: 'short' })
    expect([short.status, short.body.error.fields]).toEqual([400, { password: 'at least 10 characters' }])
    expect((await describeInvite(inv.token)).status).toBe(200)
  })
})

describe('revoking an invitation', () => {
  it('removes it from the list and makes its link dead; a second revoke is 404', async () => {
    const inv = await invited({ email: 'revoked@users.example', name: 'Revoked', role: 'viewer' })
    const res = await t.api().delete(`/api/v1/users/invitations/${inv.id}`).set(owner)
    expect(res.status).toBe(204)
    const pending = await t.api().get('/api/v1/users/invitations').set(owner)
    expect(pending.body.map((i: { id: number }) => i.id)).not.toContain(inv.id)
    expect((await describeInvite(inv.token)).status).toBe(404)
    expect((await accept({ token: inv.token, password: NEW_PASSWORD })).status).toBe(404)
    expect((await t.api().delete(`/api/v1/users/invitations/${inv.id}`).set(owner)).status).toBe(404)
  })
})

describe('managing users', () => {
  let team: TestOrg
  let teamOwner: Record<string, string>
  beforeAll(async () => {
    team = await t.createOrg('Team')
    teamOwner = bearer(team.users.owner.token)
  })

  it('lists the organization’s users by name, without password hashes', async () => {
    const res = await t.api().get('/api/v1/users').set(teamOwner)
    expect(res.body.map((u: { name: string }) => u.name)).toEqual(['keeper of Team', 'owner of Team', 'viewer of Team'])
    expect(Object.keys(res.body[0]).sort()).toEqual(['active', 'clientId', 'createdAt', 'email', 'id', 'name', 'organizationId', 'role', 'siteIds'])
  })

  it('a role change applies and ends the user’s sessions; a rename with the same role does not', async () => {
    const keeperToken = team.users.keeper.token
    const renamed = await patchUser(team.users.keeper.id, { name: 'Kim', role: 'keeper' }, teamOwner)
    expect([renamed.status, renamed.body.name, renamed.body.role]).toEqual([200, 'Kim', 'keeper'])
    expect((await me(keeperToken)).status).toBe(200)
    const demoted = await patchUser(team.users.keeper.id, { role: 'viewer' }, teamOwner)
    expect(demoted.body.role).toBe('viewer')
    const stale = await me(keeperToken)
    expect([stale.status, stale.body.error.code]).toEqual([401, 'unauthenticated'])
    const fresh = await signIn(team.users.keeper.email, TEST_PASSWORD)
    expect(fresh.body.user.role).toBe('viewer')
    const write = await t.api().post('/api/v1/sites').set(bearer(fresh.body.token)).send({ name: 'Nope', timeZone: 'UTC' })
    expect(write.status).toBe(403)
  })

  it('sets a viewer’s sites, sorted, and refuses an empty change', async () => {
    const [a, b] = team.siteIds
    const res = await patchUser(team.users.viewer.id, { siteIds: [b, a] }, teamOwner)
    expect(res.body.siteIds).toEqual([a, b].sort((x, y) => x - y))
    const empty = await patchUser(team.users.viewer.id, {}, teamOwner)
    expect([empty.status, empty.body.error.fields]).toEqual([400, { body: 'nothing to change' }])
  })

  it('deactivating a user revokes their sessions and blocks sign-in; reactivating allows it again', async () => {
    const solo = await t.createOrg('Deactivation')
    const auth = bearer(solo.users.owner.token)
    const res = await patchUser(solo.users.keeper.id, { active: false }, auth)
    expect([res.status, res.body.active]).toEqual([200, false])
    const stale = await me(solo.users.keeper.token)
    expect([stale.status, stale.body.error.code]).toEqual([401, 'unauthenticated'])
    const blocked = await signIn(solo.users.keeper.email, TEST_PASSWORD)
    expect([blocked.status, blocked.body.error.code]).toEqual([401, 'bad_credentials'])
    expect((await patchUser(solo.users.keeper.id, { active: true }, auth)).body.active).toBe(true)
    expect((await signIn(solo.users.keeper.email, TEST_PASSWORD)).status).toBe(200)
  })

  it('the last active owner can be neither demoted nor deactivated: 409 last_owner', async () => {
    const shop = await t.createOrg('One Owner')
    const auth = bearer(shop.users.owner.token)
    for (const change of [{ role: 'keeper' }, { active: false }]) {
      const res = await patchUser(shop.users.owner.id, change, auth)
      expect(res.status).toBe(409)
      expect(res.body.error).toEqual({ code: 'last_owner', message: 'The organization must keep at least one active owner' })
    }
    expect((await me(shop.users.owner.token)).body.user).toMatchObject({ role: 'owner', active: true })

    // With a second owner the first may step down; then the second is the last one.
    expect((await patchUser(shop.users.keeper.id, { role: 'owner' }, auth)).body.role).toBe('owner')
    expect((await patchUser(shop.users.owner.id, { role: 'keeper' }, auth)).body.role).toBe('keeper')
    const second = (await signIn(shop.users.keeper.email, TEST_PASSWORD)).body.token
    const last = await patchUser(shop.users.keeper.id, { active: false }, bearer(second))
    expect([last.status, last.body.error.code]).toEqual([409, 'last_owner'])
  })
})
