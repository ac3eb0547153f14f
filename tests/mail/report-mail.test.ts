import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runReportSchedules } from '../../server/reports/job'
import { bearer } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { seedReportWeek } from '../helpers/report-week'
import { startTestServer } from '../helpers/server'

// The scheduled report over the real outbox, sender and local fake SMTP server. Send times:
// Monday 9 November 2026 08:00 CET = 07:00 UTC (Europe/Berlin, UTC+1 in winter; Directive
// 2000/84/EC); Tuesday 1 December 2026 08:00 EST = 13:00 UTC (America/New_York, UTC−5 in winter;
// 15 U.S.C. § 260a). The job's own timer is slowed right down: the test drives it with fixed clocks.
let s: Awaited<ReturnType<typeof startTestServer>>
let org: TestOrg
let tankId: number

beforeAll(async () => {
  s = await startTestServer({ mail: { fakeSmtpPort: 0, from: 'Tankwarden <alerts@tankwarden.invalid>' }, reportScheduleTickMs: 3_600_000 })
  org = await s.createOrg('Report Mail Org')
  tankId = (await seedReportWeek(s.ctx, org, 'Marrowfen <b>display</b>')).id
})
afterAll(() => s?.close())

type Mail = {
  id: number
  subject: string
  envelope_to: string[]
  text_body: string
  html_body: string
  attachments: Array<{ filename: string; contentType: string; size: number }>
}
const mailbox = () => s.ctx.sequelize.query<Mail>('SELECT * FROM fake_mailbox ORDER BY id', { type: QueryTypes.SELECT })
async function deliver() {
  for (let i = 0; i < 5; i++) await s.mail.sender.runOnce()
  return mailbox()
}

describe('scheduled client reports by mail', () => {
  it('sends the week just ended at Monday 08:00 site time, once, with the PDF attached', async () => {
    const schedule = await s.ctx.models.ReportSchedule.create({
      organizationId: org.organizationId,
      tankId,
      siteId: null,
      period: 'week',
      emails: ['client@marrowfen.example'],
      userIds: [org.users.viewer.id],
    })
    expect(await runReportSchedules(s.ctx, new Date('2026-11-09T06:59:00Z'))).toBe(0)
    expect(await deliver()).toHaveLength(0)
    expect(await runReportSchedules(s.ctx, new Date('2026-11-09T07:00:00Z'))).toBe(2)
    expect(await runReportSchedules(s.ctx, new Date('2026-11-09T07:05:00Z'))).toBe(0)
    expect(await runReportSchedules(s.ctx, new Date('2026-11-10T07:00:00Z'))).toBe(0)

    const mails = await deliver()
    expect(mails.map((m) => m.envelope_to[0]).sort()).toEqual(['client@marrowfen.example', org.users.viewer.email].sort())
    for (const mail of mails) {
      expect(mail.subject).toBe('Tankwarden report: Marrowfen <b>display</b>, Week 45 of 2026 (Mon 2 Nov to Sun 8 Nov 2026)')
      expect(mail.attachments).toHaveLength(1)
      expect(mail.attachments[0]).toMatchObject({ filename: 'tankwarden-report-marrowfen-b-display-b-week-2026-11-02.pdf', contentType: 'application/pdf' })
      expect(mail.attachments[0]!.size).toBeGreaterThan(5000)
      expect(mail.html_body).toContain('Marrowfen &lt;b&gt;display&lt;/b&gt;')
      expect(mail.html_body).not.toContain('<b>display')
      expect(mail.text_body).toContain('Temperature in band 98.7 %')
      expect(mail.text_body).toContain(`/reports?tank=${tankId}&period=week&date=2026-11-02`)
    }
    await schedule.reload()
    expect(schedule.lastSentPeriod).toBe('2026-11-02')
    await schedule.update({ enabled: false }) // keeps the later cases' counts to their own schedules
  })

  it('a monthly site report follows the site zone: 1 December 08:00 in New York is 13:00 UTC', async () => {
    const before = (await mailbox()).length
    const monthly = await s.ctx.models.ReportSchedule.create({
      organizationId: org.organizationId,
      tankId: null,
      siteId: org.siteIds[1]!,
      period: 'month',
      emails: ['fishroom@marrowfen.example'],
    })
    expect(await runReportSchedules(s.ctx, new Date('2026-12-01T12:59:00Z'))).toBe(0)
    expect(await runReportSchedules(s.ctx, new Date('2026-12-01T13:00:00Z'))).toBe(1)
    const mails = (await deliver()).slice(before)
    expect(mails).toHaveLength(1)
    expect(mails[0]!.subject).toContain('November 2026')
    expect(mails[0]!.attachments[0]!.filename).toMatch(/-month-2026-11-01\.pdf$/)
    await monthly.update({ enabled: false })
  })

  it('a disabled schedule sends nothing; "send now" sends the last ended period at once', async () => {
    const row = await s.ctx.models.ReportSchedule.create({
      organizationId: org.organizationId,
      tankId,
      siteId: null,
      period: 'week',
      emails: ['now@marrowfen.example'],
      enabled: false,
    })
    expect(await runReportSchedules(s.ctx, new Date('2026-11-16T08:00:00Z'))).toBe(0)
    const before = (await mailbox()).length
    const res = await fetch(`${s.baseUrl}/api/v1/report-schedules/${row.id}/send-now`, { method: 'POST', headers: bearer(org.users.owner.token) })
    expect(res.status).toBe(200)
    const body = (await res.json()) as { queued: number; period: { label: string } }
    expect(body.queued).toBe(1)
    const mails = (await deliver()).slice(before)
    expect(mails.map((m) => m.envelope_to[0])).toEqual(['now@marrowfen.example'])
    expect(mails[0]!.subject).toContain(body.period.label)
    expect(mails[0]!.attachments[0]!.contentType).toBe('application/pdf')
    const keeper = await fetch(`${s.baseUrl}/api/v1/report-schedules/${row.id}/send-now`, { method: 'POST', headers: bearer(org.users.keeper.token) })
    expect(keeper.status).toBe(403)
  })
})
