import type { Browser } from 'playwright-core'
import { nextReportSend } from '@shared/report/period'
import { formatDayTime } from '@shared/time'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { pdfPageCount } from '../helpers/pdf-text'
import { EXPECTED, seedReportWeek, WEEK } from '../helpers/report-week'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

// A weekly report for a demo-like tank in real Chromium: it renders its figures, steps back a
// week, and the PDF download arrives as a PDF. Needs a built client (`npx vite build`).
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Marrowfen Aquatics')
  tankId = (await seedReportWeek(s.ctx, org)).id
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

describe('the report screen', () => {
  it('a viewer (the client) sees the weekly report of the tank and downloads the PDF', async () => {
    const context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    try {
      await signIn(page, s.baseUrl, org.users.viewer.email)
      await page.goto(`${s.baseUrl}/reports?tank=${tankId}&period=week&date=${WEEK.date}`)
      const label = page.locator('[data-test="report-period-label"]')
      await label.waitFor({ timeout: FIRST_LOAD_MS })
      expect(await label.textContent()).toContain('Week 45 of 2026')
      const temperature = page.locator('[data-test="report-metric-temperature"]')
      expect(await temperature.locator('[data-test="time-in-band"]').textContent()).toBe(`${EXPECTED.temperature.timeInBandPercent.toFixed(1)} %`)
      expect(await temperature.locator('[data-test="report-gaps"]').textContent()).toContain('1 gap without readings (12 h 00 min)')
      expect(await temperature.locator('svg path').count()).toBeGreaterThan(0)
      expect(await page.locator('[data-test="report-care"]').textContent()).toContain('2 done of 3 due')
      expect(await page.locator('[data-test="report-water"]').textContent()).toContain('40.0 L changed in 1 water change')
      expect(await page.locator('[data-test="report-incidents"]').textContent()).toContain('2 opened, 1 still open')
      // A viewer manages no schedules.
      expect(await page.locator('[data-test="report-schedules"]').count()).toBe(0)
      await shot(page, 'report-week')

      const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="report-download"]').click()])
      expect(download.suggestedFilename()).toBe('tankwarden-report-marrowfen-display-week-2026-11-02.pdf')
      const chunks: Buffer[] = []
      for await (const chunk of (await download.createReadStream())!) chunks.push(chunk as Buffer)
      const pdf = Buffer.concat(chunks)
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-')
      expect(pdfPageCount(pdf)).toBeGreaterThanOrEqual(1)

      await page.locator('[data-test="report-previous"]').click()
      await page.locator('[data-test="report-period-label"]', { hasText: 'Week 44 of 2026' }).waitFor()
      expect(new URL(page.url()).searchParams.get('date')).toBe('2026-11-01')
    } finally {
      await context.close()
    }
  })

  it('an owner sees the e-mail schedules and adds one', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } })
    const page = await context.newPage()
    try {
      await signIn(page, s.baseUrl, org.users.owner.email)
      await page.goto(`${s.baseUrl}/reports?tank=${tankId}&period=week&date=${WEEK.date}`)
      const panel = page.locator('[data-test="report-schedules"]')
      await panel.waitFor({ timeout: FIRST_LOAD_MS })
      await panel.getByLabel('E-mail addresses').fill('client@marrowfen.example')
      await panel.getByRole('button', { name: 'Add schedule' }).click()
      await page.locator('[data-test="report-schedule-notice"]').waitFor()
      expect(await panel.textContent()).toContain('Weekly to client@marrowfen.example')
      const rows = await s.ctx.models.ReportSchedule.findAll({ where: { tankId } })
      expect(rows.map((r) => r.emails)).toEqual([['client@marrowfen.example']])
      // The line says when the next report goes out on the site's clock, not a period it never sent.
      const zone = (await s.ctx.models.Site.findByPk(org.siteIds[0]))!.timeZone
      const next = nextReportSend('week', rows[0]!.lastSentPeriod, Date.now(), zone)
      expect(await panel.locator('.v-list-item').first().textContent()).toContain(`Next report ${formatDayTime(next.at, zone)}`)
    } finally {
      await context.close()
    }
  })
})
