import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { seedReportWeek, WEEK } from '../helpers/report-week'
import { callAs, ownerOnly, readable, roleCases, tokenOf, type RoleRow } from '../helpers/role-table'

// Who may do what on the report routes: every role reads reports within its scope; only owners
// manage schedules and send a report now; another organization gets 404, no token 401, a wall
// key 401. The same routes are listed in route-roles.test.ts (CHECKED_IN_REPORT_ROLES).
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Report Roles Org')
  other = await t.createOrg('Other Report Roles Org')
  tankId = (await seedReportWeek(t.ctx, org)).id
})
afterAll(() => t?.close())

async function freshSchedule() {
  const row = await t.ctx.models.ReportSchedule.create({
    organizationId: org.organizationId,
    tankId,
    siteId: null,
    period: 'week',
    emails: ['client@marrowfen.example'],
  })
  return row.id
}

const ROWS: RoleRow[] = [
  ['get', '/tanks/:id/report', readable, async () => ({ path: `/tanks/${tankId}/report?date=${WEEK.date}` })],
  ['get', '/tanks/:id/report/pdf', readable, async () => ({ path: `/tanks/${tankId}/report/pdf?date=${WEEK.date}` })],
  ['get', '/sites/:id/report', readable, async () => ({ path: `/sites/${org.siteIds[0]}/report?date=${WEEK.date}` })],
  ['get', '/sites/:id/report/pdf', readable, async () => ({ path: `/sites/${org.siteIds[0]}/report/pdf?date=${WEEK.date}` })],
  ['get', '/report-schedules', [200, 403, 403, 200], async () => ({ path: '/report-schedules' })],
  [
    'post',
    '/report-schedules',
    [201, 403, 403, 400],
    async () => ({ path: '/report-schedules', body: { tankId, period: 'week', emails: ['client@marrowfen.example'] } }),
  ],
  ['patch', '/report-schedules/:id', ownerOnly(200), async () => ({ path: `/report-schedules/${await freshSchedule()}`, body: { period: 'month' } })],
  ['delete', '/report-schedules/:id', ownerOnly(204), async () => ({ path: `/report-schedules/${await freshSchedule()}` })],
  ['post', '/report-schedules/:id/send-now', ownerOnly(200), async () => ({ path: `/report-schedules/${await freshSchedule()}/send-now` })],
]

describe('report route roles', () => {
  it.each(roleCases(ROWS))('$method $route as $caller → $status', async ({ method, caller, status, prepare }) => {
    const res = await callAs(t, method, await prepare(), tokenOf(caller, org, other))
    expect(res.status, JSON.stringify(res.body)).toBe(status)
  })

  it("another organization's owner sees only its own schedules, and cannot schedule our tank", async () => {
    const theirs = await t.api().get('/api/v1/report-schedules').set(bearer(other.users.owner.token))
    expect(theirs.body).toEqual([])
    const res = await t
      .api()
      .post('/api/v1/report-schedules')
      .set(bearer(other.users.owner.token))
      .send({ tankId, period: 'week', emails: ['x@example.com'] })
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ tankId: 'no such tank' })
  })
})

describe('report schedules', () => {
  const owner = () => bearer(org.users.owner.token)

  it('refuses a schedule without a recipient, with both or neither subject, or with bad addresses', async () => {
    const post = (body: object) => t.api().post('/api/v1/report-schedules').set(owner()).send(body)
    expect((await post({ tankId, period: 'week' })).body.error.fields).toHaveProperty('emails')
    expect((await post({ tankId, siteId: org.siteIds[0], period: 'week', emails: ['a@b.example'] })).body.error.fields).toHaveProperty('tankId')
    expect((await post({ period: 'week', emails: ['a@b.example'] })).status).toBe(400)
    const bad = await post({ tankId, period: 'week', emails: ['not-an-address'] })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields)[0]).toMatch(/^emails/)
    expect((await post({ tankId, period: 'fortnight', emails: ['a@b.example'] })).body.error.fields).toHaveProperty('period')
    const stranger = await post({ tankId, period: 'week', userIds: [other.users.viewer.id] })
    expect(stranger.status).toBe(400)
    expect(stranger.body.error.fields).toHaveProperty('userIds')
  })

  it('creates, lists, changes and deletes a schedule', async () => {
    const created = await t
      .api()
      .post('/api/v1/report-schedules')
      .set(owner())
      .send({ tankId, period: 'week', emails: ['Client@Marrowfen.example'], userIds: [org.users.viewer.id] })
    expect(created.status, JSON.stringify(created.body)).toBe(201)
    expect(created.body).toMatchObject({
      tankId,
      siteId: null,
      subjectName: 'Marrowfen display',
      period: 'week',
      userIds: [org.users.viewer.id],
      enabled: true,
    })
    // Made now, after this week's Monday 08:00: it starts with the next period instead of sending late.
    expect(created.body.lastSentPeriod).toMatch(/^\d{4}-\d{2}-\d{2}$/)
    const changed = await t.api().patch(`/api/v1/report-schedules/${created.body.id}`).set(owner()).send({ period: 'month', enabled: false })
    expect(changed.body).toMatchObject({ period: 'month', enabled: false, emails: ['Client@Marrowfen.example'] })
    const emptied = await t.api().patch(`/api/v1/report-schedules/${created.body.id}`).set(owner()).send({ emails: [], userIds: [] })
    expect(emptied.status).toBe(400)
    const list = await t.api().get('/api/v1/report-schedules').set(owner())
    expect(list.body.map((s: { id: number }) => s.id)).toContain(created.body.id)
    expect((await t.api().delete(`/api/v1/report-schedules/${created.body.id}`).set(owner())).status).toBe(204)
    expect((await t.api().delete(`/api/v1/report-schedules/${created.body.id}`).set(owner())).status).toBe(404)
  })
})
