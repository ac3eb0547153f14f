import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
const TANK = 'Import display tank'
const ROWS = 20_000

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Import Browser Org')
  tankId = (await createTankWithDevice(s.ctx, org, TANK)).tankId
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** Minute readings ending an hour ago, °F, with one row that has no number. */
function generatedCsv() {
  const end = Math.floor((Date.now() - 3600_000) / 60_000) * 60_000
  const lines = ['Time,Water temp (°F)']
  for (let i = 0; i < ROWS; i++) lines.push(`${new Date(end - (ROWS - 1 - i) * 60_000).toISOString()},${i === 10 ? 'n/a' : (77 + (i % 10) / 10).toFixed(1)}`)
  return Buffer.from(lines.join('\n') + '\n')
}

describe('importing a CSV file in the browser', () => {
  it('uploads, shows the preview, and follows the job to the end with a moving progress bar and the counts', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/import`)
    await page.getByText('Up to 100 MB').waitFor({ timeout: FIRST_LOAD_MS })

    await page.locator('[data-test=import-tank]').click()
    await page.getByRole('option', { name: TANK }).click()
    await page.locator('[data-test=import-file] input[type=file]').setInputFiles({ name: 'logger.csv', mimeType: 'text/csv', buffer: generatedCsv() })
    await page.locator('[data-test=import-upload]').click()

    const preview = page.locator('[data-test=import-preview]')
    await preview.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await preview.locator('th').allTextContents()).toEqual(['Time', 'Water temp (°F)'])
    expect(await page.locator('[data-test=time-format]').textContent()).toContain('ISO 8601 with offset')
    expect(await page.locator('[data-test=import-expiry]').textContent()).toContain('not started within 24 hours is deleted')
    await shot(page, 'import-mapping')
    for (const [name, viewport] of [
      ['import-expiry-desktop', { width: 1280, height: 800 }],
      ['import-expiry-phone', { width: 390, height: 844 }],
    ] as const) {
      await page.setViewportSize(viewport)
      await page.locator('[data-test=import-expiry]').scrollIntoViewIfNeeded()
      await shot(page, name)
    }
    await page.setViewportSize({ width: 1440, height: 1000 })

    await page.locator('[data-test=import-start]').click()
    const bar = page.locator('[data-test=import-bar]')
    await bar.waitFor()
    const seen: number[] = []
    const deadline = Date.now() + 120_000
    while (Date.now() < deadline) {
      seen.push(Number(await bar.getAttribute('aria-valuenow')))
      if ((await page.getByText('Import finished').count()) > 0) break
      await page.waitForTimeout(100)
    }
    await page.getByText('Import finished').waitFor({ timeout: 5000 })
    seen.push(Number(await bar.getAttribute('aria-valuenow')))
    expect(seen.some((v) => v < 100)).toBe(true)
    expect(seen.at(-1)).toBe(100)
    expect(await page.locator('[data-test=count-read]').textContent()).toBe(ROWS.toLocaleString('en-US'))
    expect(await page.locator('[data-test=count-accepted]').textContent()).toBe((ROWS - 1).toLocaleString('en-US'))
    expect(await page.locator('[data-test=count-rejected]').textContent()).toBe('1')
    await shot(page, 'import-finished')

    // The button fetches the report with the session's token and hands it to the browser as a file.
    const fetched = page.waitForResponse((r) => r.url().endsWith(`/rejections`))
    await page.locator('[data-test=import-report]').click()
    const res = await fetched
    expect(res.status()).toBe(200)
    const text = await res.text()
    expect(text.split('\n')[1]).toMatch(/^12,bad_number,"""n\/a"" is not a number",Water temp \(°F\),n\/a,/)
    expect(await page.locator('[data-test=import-error]').count()).toBe(0)

    const [{ n }] = (
      await s.ctx.sequelize.query('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1 AND source = $2', { bind: [tankId, 'import'] })
    )[0] as Array<{ n: number }>
    expect(n).toBe(ROWS - 1)
    await page.close()
  }, 180_000)
})
