import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

// Fixed cases the fuzz suites (tests/stress/fuzz-*.test.ts) found, kept as plain regressions.
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Marrowfen Input')
  const res = await t.api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send(sampleTank(org.siteIds[0]))
  tankId = res.body.id
})
afterAll(() => t?.close())

const raw = (path: string, json: string, token = org.users.owner.token) =>
  t.api().post(`/api/v1${path}`).set(bearer(token)).set('Content-Type', 'application/json').send(json)

describe('bodies the fuzzer broke, answered with a 400 naming the field', () => {
  it('sign-in with an e-mail object whose toString is not a function (was a 500 in the rate limiter)', async () => {
    const res = await raw('/auth/sign-in', '{"email":{"toString":1},"password":"x"}')
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['email'])
  })

  it('an unpaired surrogate in a jsonb value (was a 500 from PostgreSQL) stores nothing', async () => {
    const before = await t.ctx.models.CareTask.count()
    const res = await raw(
      `/tanks/${tankId}/care-tasks`,
      '{"kind":"other","title":"T","recurrence":{"kind":"interval","everyDays":1},"defaultValues":{"note":"\\udfff\\ud800"}}',
    )
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ 'defaultValues.note': 'contains an unpaired UTF-16 surrogate (not valid Unicode text)' })
    expect(await t.ctx.models.CareTask.count()).toBe(before)
  })

  it('NUL in a record key is refused, and the path names the field', async () => {
    const res = await raw(
      `/tanks/${tankId}/care-tasks`,
      '{"kind":"other","title":"T","recurrence":{"kind":"interval","everyDays":1},"defaultValues":{"a\\u0000b":1}}',
    )
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['defaultValues.a?b'])
  })

  it('an array body holding a NUL names the body, not an array index', async () => {
    const res = await raw('/sites', '["x","\\u0000"]')
    expect(res.status).toBe(400)
    expect(Object.keys(res.body.error.fields)).toEqual(['body'])
  })

  it('NUL in a stored string still names its field', async () => {
    const res = await raw('/sites', '{"name":"Back\\u0000room","timeZone":"Europe/Paris"}')
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ name: 'control character NUL is not allowed' })
  })
})
