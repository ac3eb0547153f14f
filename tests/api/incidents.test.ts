import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import type { IncidentNotifier } from '../../server/incidents/notifier'
import { ACK_LINK_HOURS, ackLinksService } from '../../server/incidents/ack-links'
import { incidentsService } from '../../server/incidents/incidents'
import { metricOfSpec } from '@shared/rules/kinds'
import type { IncidentDetail, PublicIncident } from '@shared/schemas/incidents'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

const MIN = 60_000
const timing = { escalateAlarmAfterMinutes: 15, escalateWarningAfterMinutes: 60, repeatEveryMinutes: 30 }
const notifier: IncidentNotifier = { notify: async () => ['keeper@example.test'] }
const ABOVE = 'Temperature above 28 °C for 10 min'
const QUIET = 'No temperature reading for 15 min'

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Incident Org')
  other = await t.createOrg('Other Incident Org')
})
afterAll(() => t.close())

const service = () => incidentsService(t.ctx, notifier, timing)
const as = (role: 'owner' | 'keeper' | 'viewer', of = org) => bearer(of.users[role].token)
const actor = (of: TestOrg, role: 'owner' | 'keeper'): UserActor => ({
  kind: 'user',
  userId: of.users[role].id,
  organizationId: of.organizationId,
  role,
  siteIds: null,
  sessionId: 'test',
})

async function newTank(of = org, siteId = of.siteIds[0]) {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(as('owner', of))
    .send(sampleTank(siteId, { name: `Tank ${Math.random().toString(36).slice(2, 7)}` }))
  expect(res.status).toBe(201)
  return res.body.id as number
}

/** Opens an incident the way the engine does, for one of the tank's default rules. */
async function openIncident(tankId: number, ruleName = ABOVE, at = Date.now()) {
  const tank = (await t.ctx.models.Tank.findByPk(tankId))!
  const rule = (await t.ctx.models.WatchRule.findOne({ where: { tankId, name: ruleName } }))!
  const incident = await service().trip({
    rule: { id: rule.id, name: rule.name, severity: rule.severity, spec: rule.spec, metric: metricOfSpec(rule.spec) },
    tank: { id: tank.id, siteId: tank.siteId, organizationId: tank.organizationId },
    at,
    since: at - 10 * MIN,
    value: 28.7,
    snoozed: false,
  })
  return incident!.id
}

const list = async (query: string, auth = as('viewer')) => {
  const res = await t.api().get(`/api/v1/incidents?${query}`).set(auth)
  expect(res.status, JSON.stringify(res.body)).toBe(200)
  return res.body as { items: PublicIncident[]; total: number }
}
const detail = async (id: number, auth = as('viewer')) => (await t.api().get(`/api/v1/incidents/${id}`).set(auth)).body as IncidentDetail
const acknowledge = (id: number, body: object, auth = as('keeper')) => t.api().post(`/api/v1/incidents/${id}/acknowledge`).set(auth).send(body)
const resolve = (id: number, body: object, auth = as('keeper')) => t.api().post(`/api/v1/incidents/${id}/resolve`).set(auth).send(body)

describe('listing incidents', () => {
  it('filters by site, tank, state (unresolved too) and severity, newest first', async () => {
    const o = await t.createOrg('Incident List Org')
    const [shopA, shopB, room] = [await newTank(o), await newTank(o), await newTank(o, o.siteIds[1])]
    const t0 = Date.now() - 6 * 3600_000
    const hot = await openIncident(shopA, ABOVE, t0)
    const quiet = await openIncident(shopB, QUIET, t0 + 10 * MIN)
    const roomHot = await openIncident(room, ABOVE, t0 + 20 * MIN)
    await service().acknowledge(actor(o, 'keeper'), quiet, 'Probe unplugged for cleaning')
    await service().resolveByHand(actor(o, 'owner'), roomHot, 'Heater thermostat replaced')

    const ids = async (query: string) => (await list(query, as('viewer', o))).items.map((i) => i.id)
    expect(await ids('')).toEqual([roomHot, quiet, hot])
    expect(await ids(`siteId=${o.siteIds[0]}`)).toEqual([quiet, hot])
    expect(await ids(`siteId=${o.siteIds[1]}`)).toEqual([roomHot])
    expect(await ids(`tankId=${shopB}`)).toEqual([quiet])
    expect(await ids('state=unresolved')).toEqual([quiet, hot])
    expect(await ids('state=open')).toEqual([hot])
    expect(await ids('state=acknowledged')).toEqual([quiet])
    expect(await ids('state=resolved')).toEqual([roomHot])
    expect(await ids('severity=warning')).toEqual([quiet])
    expect(await ids('severity=alarm&state=unresolved')).toEqual([hot])
    const first = await list('pageSize=1', as('viewer', o))
    expect([first.total, first.items.map((i) => i.id)]).toEqual([3, [roomHot]])
    expect(first.items[0]).toMatchObject({ siteId: o.siteIds[1], tankId: room, title: ABOVE, severity: 'alarm', state: 'resolved', firstValue: 28.7 })

    const bad = await t.api().get('/api/v1/incidents?state=closed&severity=panic').set(as('viewer', o))
    expect([bad.status, Object.keys(bad.body.error.fields).sort()]).toEqual([400, ['severity', 'state']])
    expect((await list(`siteId=${o.siteIds[0]}`, as('owner', other))).items).toEqual([])
  })
})

describe('acknowledging and resolving in the app', () => {
  it('keeps the note, clears the escalation and repeat timers, and refuses a second acknowledge', async () => {
    const tankId = await newTank()
    const t0 = Date.now() - 3600_000
    const id = await openIncident(tankId, ABOVE, t0)
    await service().processDue(t0 + 15 * MIN) // escalates: the repeat timer is now set too
    const before = await detail(id)
    expect([before.escalationLevel, before.nextEscalationAt, before.nextRepeatAt]).toEqual([1, null, new Date(t0 + 45 * MIN).toISOString()])

    const res = await acknowledge(id, { note: 'Heater stuck on, unplugged it' })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      id,
      state: 'acknowledged',
      acknowledgedBy: org.users.keeper.id,
      acknowledgeNote: 'Heater stuck on, unplugged it',
      nextEscalationAt: null,
      nextRepeatAt: null,
      siteName: 'Incident Org shop',
    })
    expect(res.body.tankName).toMatch(/^Tank /)
    const again = await acknowledge(id, {}, as('owner'))
    expect([again.status, again.body.error.code]).toEqual([409, 'not_open'])

    const shown = await detail(id)
    expect(shown.timeline.map((e) => e.kind)).toEqual(['opened', 'mail_queued', 'escalated', 'mail_queued', 'acknowledged'])
    expect(shown.timeline.at(-1)).toMatchObject({ userId: org.users.keeper.id, detail: { note: 'Heater stuck on, unplugged it', via: 'app' } })
    expect(shown.timeline[0]).toMatchObject({ at: new Date(t0).toISOString(), userId: null, detail: { value: 28.7, snoozed: false } })
    await service().processDue(t0 + 120 * MIN)
    const later = await detail(id)
    expect([later.escalationLevel, later.timeline.length, later.nextRepeatAt]).toEqual([1, 5, null])
  })

  it('lets only one of two simultaneous acknowledges, or resolves, through', async () => {
    const id = await openIncident(await newTank())
    const acks = await Promise.all([acknowledge(id, { note: 'first' }), acknowledge(id, { note: 'second' }, as('owner'))])
    expect(acks.map((r) => r.status).sort()).toEqual([200, 409])
    const winner = acks.find((r) => r.status === 200)!.body as PublicIncident
    expect(await detail(id)).toMatchObject({ acknowledgedBy: winner.acknowledgedBy, acknowledgeNote: winner.acknowledgeNote })
    const resolves = await Promise.all([resolve(id, { note: 'fixed' }), resolve(id, { note: 'fixed too' }, as('owner'))])
    expect(resolves.map((r) => r.status).sort()).toEqual([200, 409])
    const kinds = (await detail(id)).timeline.map((e) => e.kind)
    expect([kinds.filter((k) => k === 'acknowledged').length, kinds.filter((k) => k === 'resolved').length]).toEqual([1, 1])
  })

  it('resolves by hand only with a note saying what was done', async () => {
    const id = await openIncident(await newTank())
    const missing = await resolve(id, {})
    expect([missing.status, Object.keys(missing.body.error.fields)]).toEqual([400, ['note']])
    const blank = await resolve(id, { note: '   ' })
    expect([blank.status, blank.body.error.fields]).toEqual([400, { note: 'say what was done' }])
    expect((await detail(id)).state).toBe('open')
    const res = await resolve(id, { note: 'Replaced the heater' })
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({
      state: 'resolved',
      resolvedBy: org.users.keeper.id,
      resolveNote: 'Replaced the heater',
      nextEscalationAt: null,
      nextRepeatAt: null,
    })
    expect((await detail(id)).timeline.at(-1)).toMatchObject({
      kind: 'resolved',
      userId: org.users.keeper.id,
      detail: { automatic: false, note: 'Replaced the heater' },
    })
    const again = await resolve(id, { note: 'twice' })
    expect([again.status, again.body.error.code]).toEqual([409, 'not_open'])
  })

  it('lets a viewer look but not act, and another organization not even look', async () => {
    const id = await openIncident(await newTank())
    expect((await detail(id, as('viewer'))).id).toBe(id)
    for (const res of [await acknowledge(id, {}, as('viewer')), await resolve(id, { note: 'done' }, as('viewer'))]) {
      expect([res.status, res.body.error.code]).toEqual([403, 'forbidden'])
    }
    const stranger = as('owner', other)
    const attempts = [
      await t.api().get(`/api/v1/incidents/${id}`).set(stranger),
      await acknowledge(id, {}, stranger),
      await resolve(id, { note: 'done' }, stranger),
    ]
    expect(attempts.map((r) => [r.status, r.body.error.code])).toEqual(Array(3).fill([404, 'not_found']))
    expect((await detail(id)).state).toBe('open')
  })
})

describe('acknowledge links', () => {
  const tokenOf = (link: string) => new URL(link).searchParams.get('token')!
  const describeLink = (token: string) => t.api().get(`/api/v1/ack-links/${token}`)
  const useLink = (token: string, note?: string) =>
    t
      .api()
      .post('/api/v1/ack-links/use')
      .send({ token, ...(note ? { note } : {}) })

  it('describes the incident and acknowledges it once, with no session', async () => {
    const tankId = await newTank()
    const id = await openIncident(tankId)
    const before = Date.now()
    const link = await ackLinksService(t.ctx).create(id, org.users.keeper.id)
    expect(link).toMatch(/^http:\/\/127\.0\.0\.1:0\/ack\?token=[A-Za-z0-9_-]{43}$/)
    const token = tokenOf(link)

    const shown = await describeLink(token)
    expect(shown.status).toBe(200)
    expect(shown.body).toMatchObject({ incident: { id, title: ABOVE, severity: 'alarm', state: 'open' }, usedAt: null, expired: false })
    expect(shown.body.incident.tankName).toMatch(/^Tank /)
    // The site's zone comes along, so the page can show every time on the site's clock.
    expect(shown.body.incident).toMatchObject({
      siteName: 'Incident Org shop',
      timeZone: 'Europe/Berlin',
      clockStyle: '24h',
      acknowledgedAt: null,
      acknowledgedBy: null,
    })
    const expiresIn = Date.parse(shown.body.expiresAt) - before
    expect(expiresIn).toBeGreaterThanOrEqual(ACK_LINK_HOURS * 3600_000)
    expect(expiresIn).toBeLessThan(ACK_LINK_HOURS * 3600_000 + 60_000)

    const used = await useLink(token, 'Seen on the phone, on my way')
    expect(used.status).toBe(200)
    expect(used.body).toMatchObject({
      state: 'acknowledged',
      alreadyHandled: false,
      incident: { id, state: 'acknowledged', acknowledgedBy: { name: 'keeper of Incident Org' } },
    })
    expect(Date.parse(used.body.incident.acknowledgedAt)).toBeGreaterThanOrEqual(before)
    expect(await detail(id)).toMatchObject({
      state: 'acknowledged',
      acknowledgedBy: org.users.keeper.id,
      acknowledgeNote: 'Seen on the phone, on my way',
      nextEscalationAt: null,
    })
    expect((await detail(id)).timeline.at(-1)).toMatchObject({ kind: 'acknowledged', userId: org.users.keeper.id, detail: { via: 'link' } })

    const usedAt = (await describeLink(token)).body.usedAt as string
    expect(Date.parse(usedAt)).toBeGreaterThanOrEqual(before)
    const second = await useLink(token)
    expect([second.status, second.body.error.code]).toEqual([409, 'link_used'])
    expect(second.body.error.message).toContain(usedAt)
  })

  it('answers 410 for an expired link and leaves the incident open', async () => {
    const id = await openIncident(await newTank())
    const token = tokenOf(await ackLinksService(t.ctx).create(id, org.users.keeper.id))
    await t.ctx.models.IncidentAckLink.update({ expiresAt: new Date(Date.now() - MIN) }, { where: { incidentId: id } })
    expect((await describeLink(token)).body.expired).toBe(true)
    const res = await useLink(token)
    expect([res.status, res.body.error.code]).toEqual([410, 'link_expired'])
    expect((await detail(id)).state).toBe('open')
  })

  it('uses up a link whose incident was already acknowledged, changing nothing', async () => {
    const id = await openIncident(await newTank())
    const token = tokenOf(await ackLinksService(t.ctx).create(id, org.users.keeper.id))
    expect((await acknowledge(id, { note: 'in the app' }, as('owner'))).status).toBe(200)
    const res = await useLink(token, 'from the mail')
    expect(res.status).toBe(200)
    expect(res.body).toMatchObject({ state: 'acknowledged', alreadyHandled: true, incident: { acknowledgedBy: { name: 'owner of Incident Org' } } })
    expect(await detail(id)).toMatchObject({ acknowledgedBy: org.users.owner.id, acknowledgeNote: 'in the app' })
  })

  it('answers 404 for an unknown token and 400 for one too short to be real', async () => {
    const unknown = 'x'.repeat(43)
    for (const res of [await describeLink(unknown), await useLink(unknown)]) expect([res.status, res.body.error.code]).toEqual([404, 'not_found'])
    for (const res of [await describeLink('short'), await useLink('short')]) expect([res.status, res.body.error.code]).toEqual([400, 'invalid_input'])
  })
})
