import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { pushAlert, startPushSender, type PushSender } from '../../server/push'
import { bearer, sampleTank } from '../helpers/app'
import { startFakePushService } from '../helpers/fake-push'
import type { TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'

// Phone alerts end to end: rule engine → push outbox → a push service on loopback speaking RFC 8030,
// which checks the VAPID header (RFC 8292) and decrypts the payload (RFC 8291) with the test's keys.
const MIN = 60_000
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let fake: Awaited<ReturnType<typeof startFakePushService>>
let sender: PushSender

beforeAll(async () => {
  s = await startTestServer({ mail: { fakeSmtpPort: 0, from: 'Tankwarden <alerts@tankwarden.invalid>' } })
  // The instance's own sender runs on the wall clock; this one runs when the test says, at the time it says.
  await s.push.stop()
  sender = startPushSender(s.ctx, { manual: true })
  fake = await startFakePushService()
  org = await s.createOrg('Push Org')
  for (let i = 0; i < 100 && !s.rules.lock.isLeader; i++) await new Promise((r) => setTimeout(r, 50))
})
afterAll(async () => {
  await sender.stop()
  await fake.close()
  await s.close()
})

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer, typed loosely like supertest's res.body: each test reads the fields it checks
const api = async (path: string, token: string, init: RequestInit = {}): Promise<{ status: number; body: any }> => {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  return { status: res.status, body: res.status === 204 ? null : await res.json() }
}
const mailsTo = async (address: string) => {
  await s.mail.sender.runOnce()
  const rows = await s.ctx.sequelize.query<{ subject: string; envelope_to: string[] }>('SELECT subject, envelope_to FROM fake_mailbox ORDER BY id', {
    type: QueryTypes.SELECT,
  })
  return rows.filter((m) => m.envelope_to.includes(address))
}
const useToken = (token: string) =>
  fetch(`${s.baseUrl}/api/v1/ack-links/use`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ token }) })

describe('a keeper who chose the phone for alarms', () => {
  let phone: ReturnType<typeof fake.subscribe>
  let subscriptionId: number

  it('enables notifications on a phone and picks the phone for alarms, mail for warnings', async () => {
    const key = await api('/push/config', org.users.keeper.token)
    expect(key.body.publicKey).toMatch(/^[\w-]{87}$/)
    phone = fake.subscribe('Pixel in the fish room')
    const added = await api('/push/subscriptions', org.users.keeper.token, { method: 'POST', body: JSON.stringify(phone.body) })
    expect(added.status).toBe(201)
    expect(added.body).toMatchObject({ label: 'Pixel in the fish room', status: 'active', service: new URL(fake.origin).host })
    subscriptionId = added.body.id
    const chosen = await api('/push/channels', org.users.keeper.token, { method: 'PUT', body: JSON.stringify({ warning: 'mail', alarm: 'phone' }) })
    expect(chosen.body).toEqual({ warning: 'mail', alarm: 'phone' })
    expect((await api('/push/channels', org.users.owner.token)).body).toEqual({ warning: 'mail', alarm: 'mail' })
    // Someone else's device is not theirs to see or remove.
    expect((await api('/push/subscriptions', org.users.owner.token)).body).toEqual([])
    expect((await api(`/push/subscriptions/${subscriptionId}`, org.users.owner.token, { method: 'DELETE' })).status).toBe(404)
  })

  it('refuses a subscription that is not one, naming the field', async () => {
    const bad = await api('/push/subscriptions', org.users.keeper.token, {
      method: 'POST',
      body: JSON.stringify({ ...phone.body, keys: { ...phone.body.keys, auth: 'c2hvcnQ' } }),
    })
    expect(bad.status).toBe(400)
    expect(Object.keys(bad.body.error.fields)).toEqual(['keys.auth'])
    const elsewhere = await api('/push/subscriptions', org.users.keeper.token, {
      method: 'POST',
      body: JSON.stringify({ ...phone.body, endpoint: 'http://10.0.0.7/push/x' }),
    })
    expect(elsewhere.status).toBe(400)
    expect(elsewhere.body.error.fields).toHaveProperty('endpoint')
  })

  it('gets the alarm on the phone, encrypted, with what is wrong and since when; escalation pushes again; Acknowledge works once', async () => {
    const site = org.siteIds[0]
    for (let weekday = 0; weekday < 7; weekday++) {
      const shift = await api(`/sites/${site}/roster/shifts`, org.users.owner.token, {
        method: 'POST',
        body: JSON.stringify({ userId: org.users.keeper.id, weekday, start: '00:00', end: '00:00' }),
      })
      expect(shift.status).toBe(201)
    }
    await api(`/sites/${site}`, org.users.owner.token, { method: 'PATCH', body: JSON.stringify({ timeZone: 'Europe/Berlin' }) })
    const tank = await api('/tanks', org.users.owner.token, { method: 'POST', body: JSON.stringify(sampleTank(site, { name: 'Reef display' })) })
    const device = await api('/devices', org.users.owner.token, {
      method: 'POST',
      body: JSON.stringify({ tankId: tank.body.id, name: 'Probe', metrics: ['temperature'], intervalSeconds: 60 }),
    })
    const t0 = Date.now() - 20 * MIN
    const readings = Array.from({ length: 13 }, (_, i) => ({ metric: 'temperature', value: 28.4 + i * 0.1, time: new Date(t0 + i * MIN).toISOString() }))
    expect((await api('/readings', device.body.token, { method: 'POST', body: JSON.stringify({ v: 1, readings }) })).body.accepted).toBe(13)
    await s.rules.engine.settle()
    const incident = (await api(`/incidents?tankId=${tank.body.id}`, org.users.keeper.token)).body.items[0]
    expect(incident).toMatchObject({ state: 'open', severity: 'alarm' })

    expect(await sender.runOnce()).toMatchObject({ claimed: 1, sent: 1 })
    const [alarm] = fake.for(phone.id)
    expect(alarm.payload).toMatchObject({
      title: 'Alarm: Reef display',
      tag: `incident-${incident.id}`,
      url: `/incidents/${incident.id}`,
      incidentId: incident.id,
      severity: 'alarm',
    })
    const since = new Intl.DateTimeFormat('en-GB', { timeZone: 'Europe/Berlin', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(
      new Date(incident.openedAt),
    )
    expect(alarm.payload.body).toMatch(new RegExp(`^Temperature \\d+\\.\\d °C.*, since \\d+ \\w+, ${since} CES?T · `))
    expect(alarm.payload.ackToken).toMatch(/^[\w-]{20,}$/)
    expect(alarm.urgency).toBe('high')
    expect(alarm.ttl).toBeGreaterThan(0)
    expect(alarm.vapid.sub).toBe('mailto:alerts@tankwarden.invalid')
    expect(alarm.vapid.publicKey).toBe((await api('/push/config', org.users.keeper.token)).body.publicKey)
    // The phone alone: no alarm mail to the keeper.
    expect(await mailsTo(org.users.keeper.email)).toEqual([])
    const timeline = (await api(`/incidents/${incident.id}`, org.users.keeper.token)).body.timeline as Array<{
      kind: string
      detail: { recipients?: string[] }
    }>
    expect(timeline.find((e) => e.kind === 'mail_queued')?.detail.recipients).toEqual([`${org.users.keeper.email} (phone)`])

    // The owner wants alarms both ways, on a tablet of their own.
    const ownerTablet = fake.subscribe('Owner tablet')
    expect((await api('/push/subscriptions', org.users.owner.token, { method: 'POST', body: JSON.stringify(ownerTablet.body) })).status).toBe(201)
    await api('/push/channels', org.users.owner.token, { method: 'PUT', body: JSON.stringify({ warning: 'mail', alarm: 'both' }) })

    // Unacknowledged for 15 minutes: the escalation reaches the keeper's phone again, the owner by mail and on the tablet.
    await s.rules.engine.tick(t0 + 26 * MIN)
    expect(await sender.runOnce()).toMatchObject({ sent: 2 })
    expect(fake.for(ownerTablet.id).map((p) => p.payload.title)).toEqual(['Escalated alarm: Reef display'])
    const escalated = fake.for(phone.id)[1]
    expect(escalated.payload.title).toBe('Escalated alarm: Reef display')
    expect(escalated.payload.body).toMatch(/^Nobody has acknowledged it: temperature/)
    expect((await mailsTo(org.users.owner.email)).map((m) => m.subject)).toEqual([expect.stringMatching(/^Escalated alarm/)])
    expect(await mailsTo(org.users.keeper.email)).toEqual([])

    // The notification's Acknowledge action: its token works once, without a session.
    const used = await useToken(escalated.payload.ackToken)
    expect(used.status).toBe(200)
    expect(((await used.json()) as { state: string }).state).toBe('acknowledged')
    const again = await useToken(escalated.payload.ackToken)
    expect(again.status).toBe(409)
    const detail = await api(`/incidents/${incident.id}`, org.users.owner.token)
    expect(detail.body).toMatchObject({ state: 'acknowledged', acknowledgedBy: org.users.keeper.id })

    // Acknowledged: no repeat, however long it stays hot.
    await s.rules.engine.tick(t0 + 120 * MIN)
    expect(await sender.runOnce()).toMatchObject({ claimed: 0 })
    expect(fake.for(phone.id)).toHaveLength(2)
  })

  it('loses nothing while the push service is down for ten minutes, and sends it once when it is back', async () => {
    const tablet = fake.subscribe('Tablet at the counter')
    const added = await api('/push/subscriptions', org.users.keeper.token, { method: 'POST', body: JSON.stringify(tablet.body) })
    fake.answer(503, tablet.id)
    expect((await api(`/push/subscriptions/${added.body.id}/test`, org.users.keeper.token, { method: 'POST' })).status).toBe(202)
    const start = Date.now()
    for (let t = start; t <= start + 10 * MIN; t += 15_000) {
      const run = await sender.runOnce(new Date(t))
      expect(run.sent + run.failed + run.gone).toBe(0)
    }
    const refusals = fake.refused.filter((r) => r.subscription === tablet.id).length
    // Backoff from 15 s doubling up to the 5-minute cap (the mail outbox's policy): 15, 30, 60, 120, 240 s fit in ten minutes.
    expect(refusals).toBeGreaterThanOrEqual(5)
    const [row] = await s.ctx.sequelize.query<{ status: string; last_error: string }>(`SELECT status, last_error FROM push_outbox WHERE subscription_id = $1`, {
      bind: [added.body.id],
      type: QueryTypes.SELECT,
    })
    expect(row).toMatchObject({ status: 'pending', last_error: expect.stringMatching(/503/) })

    fake.answer(null, tablet.id)
    expect(await sender.runOnce(new Date(start + 16 * MIN))).toMatchObject({ sent: 1 })
    expect(await sender.runOnce(new Date(start + 60 * MIN))).toMatchObject({ claimed: 0 })
    expect(fake.for(tablet.id).map((r) => r.payload.title)).toEqual(['Tankwarden test notification'])
  })

  it('marks a subscription the push service says is gone (410) as expired, and stops sending to it', async () => {
    fake.answer(410, phone.id)
    await api(`/push/subscriptions/${subscriptionId}/test`, org.users.keeper.token, { method: 'POST' })
    expect(await sender.runOnce()).toMatchObject({ gone: 1 })
    const list = (await api('/push/subscriptions', org.users.keeper.token)).body as Array<{ id: number; status: string; expiredAt: string | null }>
    expect(list.find((d) => d.id === subscriptionId)).toMatchObject({ status: 'expired', expiredAt: expect.any(String) })
    const test = await api(`/push/subscriptions/${subscriptionId}/test`, org.users.keeper.token, { method: 'POST' })
    expect(test.status).toBe(409)
    // Removing it is the person's choice; afterwards it is gone from the list.
    expect((await api(`/push/subscriptions/${subscriptionId}`, org.users.keeper.token, { method: 'DELETE' })).status).toBe(204)
    expect((await api('/push/subscriptions', org.users.keeper.token)).body.map((d: { id: number }) => d.id)).not.toContain(subscriptionId)
  })

  it('mails someone who chose the phone alone but has no device that can show it', async () => {
    const push = { organizationId: org.organizationId, dedupeKey: `fallback:${Date.now()}`, payload: { title: 'Alarm', body: 'x', tag: 't', url: '/' } }
    const viewer = await s.ctx.sequelize.transaction((t) => pushAlert(s.ctx, org.users.viewer.id, 'phone', push, t))
    expect(viewer).toEqual({ mailToo: true })
    const keeper = await s.ctx.sequelize.transaction((t) => pushAlert(s.ctx, org.users.keeper.id, 'phone', { ...push, dedupeKey: `${push.dedupeKey}:k` }, t))
    expect(keeper).toEqual({ mailToo: false })
  })
})
