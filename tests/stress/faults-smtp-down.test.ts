import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { EventMap } from '../../server/platform/events'
import { startFakeSmtp, startMail, retryDelayMs, type FakeSmtp, type RunningMail } from '../../server/mail'
import { bearer } from '../helpers/app'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { freePort } from '../helpers/ports'
import { sleep, until } from '../helpers/wait'

// Fault: the mail server is down for "ten minutes" while an incident opens and escalates.
// Time is scaled by 1/150: the app's default policy (first retry after 15 s, doubling, capped at
// 5 min) becomes 100 ms doubling to 2 s, and ten minutes of outage become 4 s.
const SCALE = 150
const RETRY = { baseMs: 15_000 / SCALE, maxMs: 300_000 / SCALE }
const OUTAGE_MS = 600_000 / SCALE
const MIN = 60_000

type Attempt = EventMap['mail.attempted'][0] & { at: number }
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let mail: RunningMail
let smtp: FakeSmtp
let smtpPort: number
const attempts: Attempt[] = []

beforeAll(async () => {
  smtpPort = await freePort()
  s = await startTestServer({ mail: { fakeSmtpPort: smtpPort, from: 'Tankwarden <alerts@tankwarden.invalid>' } })
  // The instance's own sender, with the scaled retry policy instead of the default one.
  await s.mail.stop()
  mail = await startMail(s.ctx, { pollMs: 25, retry: RETRY })
  smtp = mail.fakeSmtp!
  s.ctx.events.on('mail.attempted', (a) => void attempts.push({ ...a, at: Date.now() }))
  org = await s.createOrg('Marrowfen Aquatics mail')
  for (let i = 0; i < 100 && !s.rules.lock.isLeader; i++) await sleep(50)
})
afterAll(async () => {
  if (!smtp.isRunning()) smtp = await startFakeSmtp(s.ctx, { host: '127.0.0.1', port: smtpPort })
  await mail?.stop()
  await smtp?.stop()
  await s?.close()
})

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON answer, typed loosely like supertest's res.body: each test reads the fields it checks
async function api(path: string, token: string, init: RequestInit = {}): Promise<{ status: number; body: any }> {
  const res = await fetch(`${s.baseUrl}/api/v1${path}`, { ...init, headers: { 'content-type': 'application/json', ...bearer(token) } })
  return { status: res.status, body: res.status === 204 ? null : await res.json() }
}
type OutboxRow = { id: number; status: string; attempts: number; last_error: string | null; to_address: string; kind: string }
const outbox = () =>
  s.ctx.sequelize.query<OutboxRow>('SELECT id, status, attempts, last_error, to_address, kind FROM mail_outbox ORDER BY id', { type: QueryTypes.SELECT })
const mailbox = () =>
  s.ctx.sequelize.query<{ id: number; headers: Record<string, string>; envelope_to: string[] }>(
    'SELECT id, headers, envelope_to FROM fake_mailbox ORDER BY id',
    { type: QueryTypes.SELECT },
  )

describe('SMTP down for ten minutes during an incident', () => {
  it('retries with backoff, sends every mail once SMTP returns, none twice, and records every attempt', async () => {
    for (let weekday = 0; weekday < 7; weekday++) {
      const shift = await api(`/sites/${org.siteIds[0]}/roster/shifts`, org.users.owner.token, {
        method: 'POST',
        body: JSON.stringify({ userId: org.users.keeper.id, weekday, start: '00:00', end: '00:00' }),
      })
      expect(shift.status).toBe(201)
    }
    const node = await createTankWithDevice(s.ctx, org, 'Coral grow-out 2')
    await s.ctx.models.WatchRule.create({
      organizationId: org.organizationId,
      siteId: org.siteIds[0],
      tankId: node.tankId,
      name: 'Temperature above 28 °C for 10 min',
      severity: 'alarm',
      spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
    })
    s.ctx.events.emit('rules.changed', { tankIds: [node.tankId] })

    await smtp.stop()
    const downAt = Date.now()
    // The incident opens while the mail server is away: 13 min above 28 °C, ending now.
    const t0 = Date.now() - 12 * MIN
    const post = await api('/readings', node.token, {
      method: 'POST',
      body: JSON.stringify({
        v: 1,
        readings: Array.from({ length: 13 }, (_, i) => ({ metric: 'temperature', value: 28.6, time: new Date(t0 + i * MIN).toISOString() })),
      }),
    })
    expect(post.body.accepted).toBe(13)
    await s.rules.engine.settle()
    const [incident] = await s.ctx.models.Incident.findAll({ where: { tankId: node.tankId } })
    expect(incident.openedAt.getTime()).toBe(t0 + 10 * MIN)
    // Nobody acknowledges within 15 min: the escalation mails are queued during the outage too.
    await s.rules.engine.tick(t0 + 26 * MIN)
    // The escalations reach the outbox through the incident's events, a moment after the tick on a busy machine.
    await until(async () => (await outbox()).length >= 3)
    const queued = await outbox()
    expect(queued.map((r) => r.kind).sort()).toEqual(['incident_escalated', 'incident_escalated', 'incident_opened'])

    await sleep(Math.max(0, downAt + OUTAGE_MS - Date.now()))
    // On a busy machine the mails are queued later and retried later than the scaled policy says:
    // the outage also lasts until each has been refused three times.
    await until(async () => (await outbox()).every((r) => r.attempts >= 3), 30_000)
    const duringOutage = await outbox()
    expect(duringOutage.every((r) => r.status === 'pending' && r.attempts >= 3 && /ECONNREFUSED|connect/i.test(r.last_error ?? ''))).toBe(true)
    expect(await mailbox()).toHaveLength(0)

    smtp = await startFakeSmtp(s.ctx, { host: '127.0.0.1', port: smtpPort })
    const upAt = Date.now()
    expect(await until(async () => (await outbox()).every((r) => r.status === 'sent'), 15_000)).toBe(true)
    // Long enough for any stray second delivery to have happened.
    await sleep(1000)
    await mail.sender.runOnce()

    const rows = await outbox()
    const received = await mailbox()
    expect(received).toHaveLength(rows.length)
    const messageIds = received.map((m) => m.headers['message-id'])
    expect(new Set(messageIds).size).toBe(rows.length)
    expect(received.map((m) => m.envelope_to[0]).sort()).toEqual(rows.map((r) => r.to_address.toLowerCase()).sort())

    for (const row of rows) {
      const mine = attempts.filter((a) => a.outboxId === row.id)
      const failures = mine.filter((a) => !a.ok)
      // One success, after the mail server came back; every failure before it.
      expect(mine.filter((a) => a.ok)).toHaveLength(1)
      expect(mine.at(-1)!.ok).toBe(true)
      expect(mine.at(-1)!.at).toBeGreaterThanOrEqual(upAt)
      expect(row.attempts).toBe(failures.length + 1)
      expect(row.last_error).toBeNull()
      // Backoff: the n-th retry never comes sooner than the policy's n-th delay (25 ms slack for the round trip that records it).
      for (let n = 1; n < mine.length; n++) {
        expect(mine[n].at - mine[n - 1].at).toBeGreaterThanOrEqual(retryDelayMs(n, RETRY) - 25)
      }
    }

    // The incident's timeline shows every attempt, failed and sent.
    const timeline = await s.ctx.models.IncidentEvent.findAll({ where: { incidentId: incident.id } })
    const ofIncident = attempts.filter((a) => a.incidentId === incident.id)
    expect(timeline.filter((e) => e.kind === 'mail_failed')).toHaveLength(ofIncident.filter((a) => !a.ok).length)
    expect(timeline.filter((e) => e.kind === 'mail_sent')).toHaveLength(rows.length)
    console.log(
      `[faults] SMTP outage: ${rows.length} mails, ${attempts.length} attempts (${attempts.filter((a) => !a.ok).length} refused), each delivered once`,
    )
  })
})
