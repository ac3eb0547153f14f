import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Report } from '@shared/schemas/reports'
import { renderReportPdf } from '../../server/reports/pdf'
import { bearer, startTestApp, type TestOrg } from '../helpers/app'
import { pdfText } from '../helpers/pdf-text'
import { seedReportWeek, WEEK } from '../helpers/report-week'

// The hand-worked report week (tests/helpers/report-week.ts) for an organisation whose owner chose
// the 12-hour clock. Its reading gap runs from 2026-11-03 23:00 to 2026-11-04 11:00 UTC: midnight to
// noon in Berlin (CET, UTC+1), and an incident opened at 10:00 UTC, 11:00 in Berlin.
let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startTestApp()
  org = await t.createOrg('Clockwise Aquatics')
  tankId = (await seedReportWeek(t.ctx, org)).id
})
afterAll(() => t?.close())

describe('a report PDF on the organisation clock', () => {
  it('writes 12-hour times once the owner chooses them, and 24-hour times before', async () => {
    const report = async () => {
      const res = await t.api().get(`/api/v1/tanks/${tankId}/report?period=week&date=${WEEK.date}`).set(bearer(org.users.owner.token))
      expect(res.status, JSON.stringify(res.body)).toBe(200)
      return res.body as Report
    }
    const before = await report()
    expect(before.subject.clockStyle).toBe('24h')
    const dayText = pdfText(await renderReportPdf(before, { compress: false })).join('')
    expect(dayText).toContain('4 Nov, 00:00 to 4 Nov, 12:00')
    expect(dayText).toContain('3 Nov, 11:00 · alarm')

    const chosen = await t.api().patch('/api/v1/organization').set(bearer(org.users.owner.token)).send({ clockStyle: '12h' })
    expect(chosen.status).toBe(200)
    const after = await report()
    expect(after.subject.clockStyle).toBe('12h')
    const text = pdfText(await renderReportPdf(after, { compress: false })).join('')
    expect(text).toContain('4 Nov, 12:00 am to 4 Nov, 12:00 pm')
    expect(text).toContain('3 Nov, 11:00 am · alarm')
    expect(text).not.toContain('00:00')
    expect(text).not.toContain('11:00 ·')
  })
})
