import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Clock Org')
})
afterAll(() => t.close())

const me = async (token: string) => (await t.api().get('/api/v1/auth/me').set(bearer(token))).body

describe('PATCH /organization: how clock times read', () => {
  it('starts at 24-hour for everyone in the organisation', async () => {
    expect((await me(org.users.viewer.token)).organization).toMatchObject({ id: org.organizationId, name: 'Clock Org', clockStyle: '24h' })
  })

  it('lets an owner switch to 12-hour, which every member then reads', async () => {
    const res = await t.api().patch('/api/v1/organization').set(bearer(org.users.owner.token)).send({ clockStyle: '12h' })
    expect(res.status).toBe(200)
    expect(res.body).toEqual({ id: org.organizationId, name: 'Clock Org', clockStyle: '12h' })
    expect((await me(org.users.keeper.token)).organization.clockStyle).toBe('12h')
    const row = await t.ctx.models.Organization.findByPk(org.organizationId)
    expect(row?.clockStyle).toBe('12h')
  })

  it('refuses a style it does not know, naming the field, and changes nothing', async () => {
    const res = await t.api().patch('/api/v1/organization').set(bearer(org.users.owner.token)).send({ clockStyle: '36h' })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toHaveProperty('clockStyle')
    expect((await me(org.users.owner.token)).organization.clockStyle).toBe('12h')
  })

  it('is for owners only', async () => {
    const res = await t.api().patch('/api/v1/organization').set(bearer(org.users.keeper.token)).send({ clockStyle: '24h' })
    expect(res.status).toBe(403)
    expect((await me(org.users.owner.token)).organization.clockStyle).toBe('12h')
  })
})
