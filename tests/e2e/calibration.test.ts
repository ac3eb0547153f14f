import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let node: Awaited<ReturnType<typeof createTankWithDevice>>

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Calibration Page Org')
  node = await createTankWithDevice(s.ctx, org, 'Probe display')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const sendPh = (value: number) =>
  fetch(`${s.baseUrl}/api/v1/readings`, {
    method: 'POST',
    headers: { Authorization: `Bearer ${node.token}`, 'Content-Type': 'application/json' },
    body: JSON.stringify({ v: 1, readings: [{ metric: 'ph', value, time: new Date(Date.now() - 30_000).toISOString() }] }),
  })

async function openCalibration(page: Page) {
  await page.goto(`${s.baseUrl}/tanks/${node.tankId}`)
  const button = page.locator(`[data-test=calibration-${node.deviceId}]`)
  await button.scrollIntoViewIfNeeded({ timeout: FIRST_LOAD_MS })
  await button.click()
  return page.locator('[data-test=calibration-dialog]')
}

describe('recording a pH calibration on the device page', () => {
  it('a keeper records two buffers, sees the slope and the history, and the chart offers the values as sent', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const dialog = await openCalibration(page)
    await expect.poll(() => dialog.textContent()).toContain('Not calibrated yet')
    await dialog.locator('[data-test=record-calibration]').click()
    const form = page.locator('[data-test=calibration-form]')
    await form.locator('input[name=reading-0]').fill('7.10')
    await form.locator('input[name=reading-1]').fill('4.20')
    await shot(page, 'calibration-form-desktop')
    await form.locator('[data-test=save-calibration]').click()
    // 2.90 pH of response over 2.99 pH of buffers (two-point method, IUPAC Recommendations 2002, Buck et al.).
    await expect.poll(() => dialog.locator('[data-test=calibration-result]').textContent()).toContain('slope 97.0 %')
    await expect.poll(() => dialog.locator('[data-test=calibration-row]').count()).toBe(1)
    expect(await dialog.locator('[data-test=slope-trend] svg').getAttribute('aria-label')).toContain('97.0 %')
    await shot(page, 'calibration-desktop')

    // Readings from now on are corrected; the chart can show what the device sent.
    expect((await sendPh(7.1)).status).toBe(200)
    await page.keyboard.press('Escape')
    await page.reload()
    const toggle = page.locator('[data-test=values-ph]')
    await toggle.scrollIntoViewIfNeeded({ timeout: FIRST_LOAD_MS })
    await toggle.getByRole('button', { name: 'As sent' }).click()
    await expect.poll(() => page.locator('[data-test=metric-panel-ph] .v-card-subtitle').textContent()).toContain('as the device sent them')
    await page.close()
  })

  it('on a phone: a tired probe is told to be cleaned or replaced', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const dialog = await openCalibration(page)
    await dialog.locator('[data-test=record-calibration]').click()
    const form = page.locator('[data-test=calibration-form]')
    await form.locator('input[name=reading-0]').fill('7.00')
    await form.locator('input[name=reading-1]').fill('4.50')
    await shot(page, 'calibration-form-phone')
    await form.locator('[data-test=save-calibration]').click()
    await expect.poll(() => dialog.locator('[data-test=calibration-result]').textContent()).toContain('clean the probe')
    await expect.poll(() => dialog.locator('[data-test=calibration-row]').count()).toBe(2)
    await shot(page, 'calibration-phone')
    await page.close()
  })
})
