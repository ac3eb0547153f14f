import request from 'supertest'
import WebSocket from 'ws'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { INSTANT_FORMAT_MESSAGE, INSTANT_RANGE_MESSAGE, LOCAL_DATE_RANGE_MESSAGE, OFFSET_RANGE_MESSAGE } from '@shared/schemas/time'
import { ACCOUNT_LIMIT_FACTOR } from '../../server/people/auth-routes'
import { bearer, sampleTank, TEST_PASSWORD, type TestOrg } from '../helpers/app'
import { createTankWithDevice } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { until } from '../helpers/wait'

// Hostile requests against a whole running instance (HTTP and the live socket on a real port).
// Not repeated here: roles per route (route-roles), tenancy, token forgery (security-tokens),
// live-socket scope (security-live), body fuzzing (tests/stress/fuzz-http).
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let tankId: number
let deviceToken: string

beforeAll(async () => {
  s = await startTestServer({ signInLimit: 3 })
  org = await s.createOrg('Fenwick Hostile')
  const tank = await api().post('/api/v1/tanks').set(bearer(org.users.owner.token)).send(sampleTank(org.siteIds[0]))
  tankId = tank.body.id
  deviceToken = (await createTankWithDevice(s.ctx, org, 'Hostile sensor tank')).token
}, 120_000)
afterAll(() => s?.close())

const api = () => request(s.baseUrl)
const owner = () => bearer(org.users.owner.token)

describe('sign-in limit', () => {
  it('ignores X-Forwarded-For unless TRUST_PROXY names the proxy: a new header buys no new attempts', async () => {
    const email = org.users.keeper.email
    const tries = []
    for (let i = 0; i < 5; i++) {
      tries.push(
        (
          await api()
            .post('/api/v1/auth/sign-in')
            .set('X-Forwarded-For', `203.0.113.${i + 1}`)
            .send({ email, password: 'wrong password' })
        ).status,
      )
    }
    expect(tries).toEqual([401, 401, 401, 429, 429])
  })

  it('caps attempts on one account from every address together', async () => {
    const { createApp } = await import('../../server/app')
    // The same context behind a proxy that is trusted, so each forwarded address counts as its own.
    const proxied = createApp({ ...s.ctx, config: { ...s.ctx.config, trustProxy: ['loopback'] } })
    const email = org.users.viewer.email
    const statuses: number[] = []
    for (let i = 0; i < 3 * ACCOUNT_LIMIT_FACTOR + 2; i++) {
      statuses.push(
        (
          await request(proxied)
            .post('/api/v1/auth/sign-in')
            .set('X-Forwarded-For', `198.51.100.${i + 1}`)
            .send({ email, password: 'wrong password' })
        ).status,
      )
    }
    expect(statuses.filter((x) => x === 401)).toHaveLength(3 * ACCOUNT_LIMIT_FACTOR)
    expect(statuses.slice(-2)).toEqual([429, 429])
    // The right password is refused too until the window ends: the limit is on attempts, not failures.
    expect((await request(proxied).post('/api/v1/auth/sign-in').set('X-Forwarded-For', '198.51.100.250').send({ email, password: TEST_PASSWORD })).status).toBe(
      429,
    )
  })
})

describe('one time schema for every instant', () => {
  const YEAR_ZERO = '0000-01-01T00:00:00Z'
  const queries = () => [
    `/api/v1/tanks/${tankId}/photos?from=${YEAR_ZERO}`,
    `/api/v1/tanks/${tankId}/test-kit-entries?from=${YEAR_ZERO}`,
    `/api/v1/tanks/${tankId}/care-log?to=${YEAR_ZERO}`,
    `/api/v1/tanks/${tankId}/series?metric=temperature&from=${YEAR_ZERO}`,
    `/api/v1/incidents?from=${YEAR_ZERO}`,
    `/api/v1/sites/${org.siteIds[0]}/roster/on-duty?at=${YEAR_ZERO}`,
    `/api/v1/sites/${org.siteIds[0]}/roster/overrides?from=${YEAR_ZERO}`,
    `/api/v1/tanks/${tankId}/exports/readings.csv?from=${YEAR_ZERO}&to=2026-01-01T00:00:00Z`,
  ]

  it('a year-0000 query parameter is a 400 naming the parameter on every route', async () => {
    for (const path of queries()) {
      const res = await api().get(path).set(owner())
      const field = /[?&](from|to|at)=0000/.exec(path)![1]!
      expect([path, res.status, res.body.error?.fields?.[field]]).toEqual([path, 400, INSTANT_RANGE_MESSAGE])
    }
  })

  it('year-0000 and out-of-range body fields are 400s naming the field, and nothing is stored', async () => {
    const bodies: Array<[string, string, object, string]> = [
      [`/api/v1/tanks/${tankId}/test-kit-entries`, 'takenAt', { takenAt: YEAR_ZERO, values: [{ metric: 'ph', value: 7, unit: 'pH' }] }, INSTANT_RANGE_MESSAGE],
      [`/api/v1/tanks/${tankId}/care-log`, 'at', { kind: 'note', text: 'x', at: '2026-01-01T00:00:00+23:59' }, OFFSET_RANGE_MESSAGE],
      [`/api/v1/tanks/${tankId}/livestock`, 'addedAt', { name: 'Snails', count: 3, addedAt: '9999-12-31T00:00:00Z' }, INSTANT_RANGE_MESSAGE],
      [`/api/v1/tanks/${tankId}/snoozes`, 'startsAt', { reason: 'Maintenance', startsAt: YEAR_ZERO, endsAt: '0000-01-01T01:00:00Z' }, INSTANT_RANGE_MESSAGE],
      [
        `/api/v1/sites/${org.siteIds[0]}/roster/overrides`,
        'startsAt',
        { userId: org.users.keeper.id, kind: 'add', startsAt: YEAR_ZERO, endsAt: '2026-01-01T00:00:00Z' },
        INSTANT_RANGE_MESSAGE,
      ],
      [`/api/v1/tanks/${tankId}/care-log`, 'at', { kind: 'note', text: 'x', at: '2026-06-30T23:59:60Z' }, INSTANT_FORMAT_MESSAGE],
    ]
    const counts = async () =>
      Promise.all(
        ['test_kit_entries', 'care_log', 'livestock', 'snoozes', 'duty_overrides'].map(async (table) => {
          const [rows] = await s.ctx.sequelize.query(`SELECT count(*)::int AS n FROM ${table}`)
          return (rows as Array<{ n: number }>)[0]!.n
        }),
      )
    const before = await counts()
    for (const [path, field, body, message] of bodies) {
      const res = await api().post(path).set(owner()).send(body)
      expect([path, res.status, res.body.error?.fields?.[field]]).toEqual([path, 400, message])
    }
    expect(await counts()).toEqual(before)
  })

  it('a calendar date outside the same years is a 400 naming it', async () => {
    const res = await api().get(`/api/v1/sites/${org.siteIds[0]}/roster/week?start=0100-01-04`).set(owner())
    expect([res.status, res.body.error.fields]).toEqual([400, { start: LOCAL_DATE_RANGE_MESSAGE }])
  })

  it('the edges of real offsets are accepted: +14:00 and -12:00', async () => {
    for (const at of ['2026-03-01T12:00:00+14:00', '2026-03-01T12:00:00-12:00']) {
      const res = await api().get(`/api/v1/sites/${org.siteIds[0]}/roster/on-duty`).query({ at }).set(owner())
      expect([at, res.status, res.body.at]).toEqual([at, 200, new Date(at).toISOString()])
    }
  })

  it("the live socket's since: a year-0000 catch-up is refused as a bad message, not an internal error", async () => {
    const ws = new WebSocket(`${s.baseUrl.replace('http', 'ws')}/ws`)
    const frames: Array<{ type: string; code?: string }> = []
    ws.on('message', (data) => frames.push(JSON.parse(data.toString())))
    await new Promise((resolve, reject) => ws.once('open', resolve).once('error', reject))
    ws.send(JSON.stringify({ type: 'auth', token: org.users.owner.token }))
    expect(await until(() => frames.some((f) => f.type === 'ready'), 5000, 20)).toBe(true)
    ws.send(JSON.stringify({ type: 'subscribe', siteId: org.siteIds[0], since: YEAR_ZERO }))
    expect(await until(() => frames.some((f) => f.type === 'error' || f.type === 'subscribed'), 5000, 20)).toBe(true)
    ws.close()
    expect(frames.find((f) => f.type === 'error' || f.type === 'subscribed')).toMatchObject({ type: 'error', code: 'invalid_message' })
  })
})

describe('races on a unique index answer 409', () => {
  it('four concurrent starts of a water change: one 201, three 409s saying why', async () => {
    const answers = await Promise.all(
      Array.from({ length: 4 }, () => api().post(`/api/v1/tanks/${tankId}/water-changes`).set(owner()).send({ percent: 10, heaterOffConfirmed: true })),
    )
    expect(answers.map((a) => a.status).sort()).toEqual([201, 409, 409, 409])
    for (const a of answers.filter((x) => x.status === 409))
      expect(a.body.error).toMatchObject({ code: 'water_change_in_progress', message: expect.stringMatching(/already in progress/) })
    const [rows] = await s.ctx.sequelize.query(`SELECT count(*)::int AS n FROM water_changes WHERE tank_id = ${tankId} AND status = 'in_progress'`)
    expect((rows as Array<{ n: number }>)[0]!.n).toBe(1)
  })

  it('four concurrent overrides of one site rule on one tank: one succeeds, the rest are 409s', async () => {
    const rule = await api()
      .post(`/api/v1/sites/${org.siteIds[0]}/rules`)
      .set(owner())
      .send({ name: 'pH below 6.2', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.2, holdMinutes: 30 } })
    expect(rule.status).toBe(201)
    const answers = await Promise.all(
      Array.from({ length: 4 }, () =>
        api()
          .put(`/api/v1/tanks/${tankId}/rules/${rule.body.id}/override`)
          .set(owner())
          .send({ spec: { kind: 'below', metric: 'ph', limit: 6.0, holdMinutes: 30 } }),
      ),
    )
    const statuses = answers.map((a) => a.status)
    expect(statuses.filter((x) => x >= 500)).toEqual([])
    expect(statuses.filter((x) => x === 200 || x === 201).length).toBeGreaterThanOrEqual(1)
    for (const a of answers.filter((x) => x.status === 409)) expect(a.body.error.code).toBe('override_exists')
    const [rows] = await s.ctx.sequelize.query(`SELECT count(*)::int AS n FROM watch_rules WHERE tank_id = ${tankId} AND overrides_rule_id = ${rule.body.id}`)
    expect((rows as Array<{ n: number }>)[0]!.n).toBe(1)
  })
})

describe('tokens only in the Authorization header', () => {
  it('refuses a bearer token in ?access_token= or in a body field', async () => {
    const token = org.users.owner.token
    expect((await api().get(`/api/v1/auth/me?access_token=${token}`)).status).toBe(401)
    expect((await api().post('/api/v1/sites').send({ access_token: token, name: 'Sneaky', timeZone: 'Europe/Paris' })).status).toBe(401)
    expect((await api().get('/api/v1/auth/me').set(bearer(token))).status).toBe(200)
  })
})

describe('headers', () => {
  it('authenticated JSON and report PDFs are no-store', async () => {
    const me = await api().get('/api/v1/auth/me').set(owner())
    expect([me.status, me.headers['cache-control']]).toEqual([200, 'no-store'])
    const pdf = await api().get(`/api/v1/tanks/${tankId}/report/pdf`).set(owner())
    expect([pdf.status, pdf.headers['content-type'], pdf.headers['cache-control']]).toEqual([200, 'application/pdf', 'no-store'])
  })

  it('the CSP lets the page open sockets to its own host only', async () => {
    const res = await api().get('/api/v1/health')
    const connect = /connect-src ([^;]*)/.exec(res.headers['content-security-policy'])![1]!.split(' ')
    const host = new URL(s.baseUrl).host
    expect(connect).toEqual(["'self'", `ws://${host}`, `wss://${host}`])
    // A wall key in the page's address is never sent on to other sites as a Referer.
    expect(res.headers['referrer-policy']).toBe('no-referrer')
  })
})

describe('POST /readings', () => {
  it('a 400 names the field, as every 400 does', async () => {
    const wrongVersion = await api().post('/api/v1/readings').set(bearer(deviceToken)).send({ v: 2, readings: [] })
    expect([wrongVersion.status, Object.keys(wrongVersion.body.error.fields ?? {})]).toEqual([400, ['v']])
    const tooMany = await api()
      .post('/api/v1/readings')
      .set(bearer(deviceToken))
      .send({ v: 1, readings: Array.from({ length: 1001 }, () => ({})) })
    expect([tooMany.status, Object.keys(tooMany.body.error.fields ?? {})]).toEqual([400, ['readings']])
    const notJson = await api().post('/api/v1/readings').set(bearer(deviceToken)).set('Content-Type', 'application/json').send('{"v":1,')
    expect([notJson.status, notJson.body.error.fields]).toEqual([400, { body: 'not valid JSON' }])
  })
})

describe('ids past what the database stores', () => {
  // Every id column is PostgreSQL's integer (at most 2^31 − 1, PostgreSQL documentation, "Numeric Types").
  const tooBig = '99999999999'
  it.each([
    ['a tank', `/api/v1/tanks/${tooBig}`],
    ['a tank’s care tasks', `/api/v1/tanks/${tooBig}/care-tasks`],
    ['an incident', `/api/v1/incidents/${tooBig}`],
    ['a livestock batch', `/api/v1/livestock/batches/${tooBig}`],
    ['a visit', `/api/v1/visits/${tooBig}`],
    ['a device’s calibrations', `/api/v1/devices/${tooBig}/calibrations`],
  ])('%s → 400 naming the id, never 500', async (_what, path) => {
    const res = await api().get(path).set(owner())
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.error.fields).toHaveProperty('id')
  })

  it('a query filter past it → 400 naming the filter', async () => {
    const res = await api().get('/api/v1/incidents').query({ tankId: tooBig }).set(owner())
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.error.fields).toHaveProperty('tankId')
  })
})
