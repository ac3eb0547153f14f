import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { sleep, until } from '../helpers/wait'

const MIN = 60_000
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg

beforeAll(async () => {
  s = await startTestServer({ mail: { fakeSmtpPort: 0, from: 'Tankwarden <alerts@tankwarden.invalid>' } })
  org = await s.createOrg('Alert Flow Org')
  await until(() => s.rules.lock.isLeader, 5000, 50)
})
afterAll(() => s.close())

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer, typed loosely like supertest's res.body: each test reads the fields it checks
const api = async (path: string, token: string, init: RequestInit = {}): Promise<{ status: number; body: any }> => {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  return { status: res.status, body: res.status === 204 ? null : await res.json() }
}
type Mail = { id: number; subject: string; envelope_to: string[]; text_body: string; html_body: string; attachments: Array<{ contentType: string }> }
const mailbox = () => s.ctx.sequelize.query<Mail>('SELECT * FROM fake_mailbox ORDER BY id', { type: QueryTypes.SELECT })

async function waitForMail(count: number) {
  await until(async () => (await s.mail.sender.runOnce(), (await mailbox()).length >= count), 10_000)
  return mailbox()
}

describe('a heater stuck on, from reading to mail', () => {
  it('mails the keeper on duty once, escalates to the owner, stops when acknowledged by link, and sends the all-clear', async () => {
    const site = org.siteIds[0]
    // The keeper is on duty around the clock this week.
    for (let weekday = 0; weekday < 7; weekday++) {
      const shift = await api(`/sites/${site}/roster/shifts`, org.users.owner.token, {
        method: 'POST',
        body: JSON.stringify({ userId: org.users.keeper.id, weekday, start: '00:00', end: '00:00' }),
      })
      expect(shift.status).toBe(201)
    }
    const tank = await api('/tanks', org.users.owner.token, { method: 'POST', body: JSON.stringify(sampleTank(site, { name: 'Sales row <b>A1</b>' })) })
    const device = await api('/devices', org.users.owner.token, {
      method: 'POST',
      body: JSON.stringify({ tankId: tank.body.id, name: 'Probe', metrics: ['temperature', 'water_level'], intervalSeconds: 60 }),
    })
    // The clock below runs up to two hours ahead of the readings (no reading may come from the
    // future): the tank's own "no reading" watch would rightly trip, a fault of its own, not this one.
    const quiet = (await s.ctx.models.WatchRule.findAll({ where: { tankId: tank.body.id } })).filter((r) => r.spec.kind === 'quiet')
    expect(quiet).toHaveLength(1)
    await s.ctx.models.WatchRule.destroy({ where: { id: quiet.map((r) => r.id) } })
    s.ctx.events.emit('rules.changed', { tankIds: [tank.body.id] })
    await s.rules.engine.settle()
    const post = (points: Array<[number, number]>) =>
      api('/readings', device.body.token, {
        method: 'POST',
        body: JSON.stringify({ v: 1, readings: points.map(([at, value]) => ({ metric: 'temperature', value, time: new Date(at).toISOString() })) }),
      })

    const t0 = Date.now() - 20 * MIN
    expect((await post(Array.from({ length: 13 }, (_, i) => [t0 + i * MIN, 28.4 + i * 0.1]))).body.accepted).toBe(13)
    await s.rules.engine.settle()

    const incidents = await api(`/incidents?tankId=${tank.body.id}`, org.users.keeper.token)
    expect(incidents.body.total).toBe(1)
    const incident = incidents.body.items[0]
    expect(incident).toMatchObject({ state: 'open', severity: 'alarm', title: 'Temperature above 28 °C for 10 min' })
    expect(new Date(incident.openedAt).getTime()).toBe(t0 + 10 * MIN)

    let mails = await waitForMail(1)
    expect(mails).toHaveLength(1)
    expect(mails[0].envelope_to).toEqual([org.users.keeper.email])
    expect(mails[0].subject).toMatch(/^Alarm: temperature \d+\.\d °C, above 28 °C on /)
    expect(mails[0].html_body).toContain('Sales row &lt;b&gt;A1&lt;/b&gt;')
    expect(mails[0].html_body).not.toContain('<b>A1</b>')
    expect(mails[0].text_body).toMatch(/Unplug heaters, pumps and lights before hands go in the water/)
    expect(mails[0].attachments.some((a) => a.contentType === 'image/png')).toBe(true)
    const ackUrl = /(https?:\/\/\S+\/ack\?token=[\w-]+)/.exec(mails[0].text_body)![1]

    // Unacknowledged for 15 minutes: the escalation goes to the keeper on duty and the owner.
    await s.rules.engine.tick(t0 + 26 * MIN)
    mails = await waitForMail(3)
    expect(
      mails
        .slice(1)
        .map((m) => m.envelope_to[0])
        .sort(),
    ).toEqual([org.users.keeper.email, org.users.owner.email].sort())
    expect(mails.slice(1).every((m) => /escalat/i.test(m.subject))).toBe(true)

    // The keeper acknowledges from the mail, with no session: it works once.
    const token = new URL(ackUrl).searchParams.get('token')!
    const used = await fetch(`${s.baseUrl}/api/v1/ack-links/use`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ token, note: 'Heater unplugged' }),
    })
    expect(used.status).toBe(200)
    const again = await fetch(`${s.baseUrl}/api/v1/ack-links/use`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ token }),
    })
    expect(again.status).toBe(409)
    expect(((await again.json()) as { error: { message: string } }).error.message).toMatch(/already used/)

    // No repeat after acknowledging, however long it stays hot.
    await s.rules.engine.tick(t0 + 120 * MIN)
    await s.mail.sender.runOnce()
    expect(await mailbox()).toHaveLength(3)

    // The scenario ends: the temperature falls below 27.5 °C and, once the rule's 30-minute settle
    // window passes without it coming back, everyone told hears the all-clear.
    await post([[Date.now() - MIN, 27.2]])
    await s.rules.engine.settle()
    await s.rules.engine.tick(Date.now() + 20 * MIN)
    await s.mail.sender.runOnce()
    expect(await mailbox()).toHaveLength(3)
    await s.rules.engine.tick(Date.now() + 30 * MIN)
    mails = await waitForMail(5)
    expect(mails).toHaveLength(5)
    expect(
      mails
        .slice(3)
        .map((m) => m.envelope_to[0])
        .sort(),
    ).toEqual([org.users.keeper.email, org.users.owner.email].sort())
    const detail = await api(`/incidents/${incident.id}`, org.users.viewer.token)
    expect(detail.body.state).toBe('resolved')
    expect(detail.body.acknowledgedBy).toBe(org.users.keeper.id)
    const timeline = detail.body.timeline as Array<{ kind: string; detail: { to?: string } }>
    expect(timeline.filter((e) => e.kind !== 'mail_sent').map((e) => e.kind)).toEqual([
      'opened',
      'mail_queued',
      'escalated',
      'mail_queued',
      'acknowledged',
      'resolved',
      'mail_queued',
    ])
    // Every delivery is on the timeline with its result: five mails, each sent.
    await sleep(300)
    const later = (await api(`/incidents/${incident.id}`, org.users.viewer.token)).body.timeline as typeof timeline
    expect(
      later
        .filter((e) => e.kind === 'mail_sent')
        .map((e) => e.detail.to)
        .sort(),
    ).toEqual([org.users.keeper.email, org.users.keeper.email, org.users.owner.email, org.users.keeper.email, org.users.owner.email].sort())
  })
})
