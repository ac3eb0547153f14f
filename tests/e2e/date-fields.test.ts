import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

// The roster's date and time fields in Chromium: the product's own day and clock words (the
// organisation chose the 12-hour clock), typed or picked with the keyboard alone.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Lanternfin Aquatics')
  await s.ctx.models.Organization.update({ clockStyle: '12h' }, { where: { id: org.organizationId } })
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function openRoster(page: Page) {
  await page.goto(`${s.baseUrl}/sites/${org.siteIds[0]}/roster`, { timeout: FIRST_LOAD_MS })
  await page.locator('[data-test="week-picker"] input').waitFor({ timeout: FIRST_LOAD_MS })
}

describe('date and time fields', () => {
  it('show no browser date format, read typed days and 12-hour times, and pick a week on the calendar by keyboard', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 }, reducedMotion: 'reduce' })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.owner.email)
    await openRoster(page)
    expect(await page.locator('input[type="date"], input[type="time"], input[type="datetime-local"]').count()).toBe(0)
    const week = page.locator('[data-test="week-picker"] input')
    expect(await week.inputValue()).toMatch(/^Mon \d{1,2} [A-Z][a-z]{2} \d{4}$/)

    await week.fill('18/11/2026')
    await week.press('Enter')
    await expect.poll(() => week.inputValue()).toBe('Mon 16 Nov 2026')
    await page.getByRole('button', { name: 'Week of: choose on a calendar' }).focus()
    await page.keyboard.press('Enter')
    const calendar = page.locator('.v-date-picker')
    await calendar.waitFor()
    await shot(page, 'date-field-calendar-desktop')
    await calendar.getByRole('button', { name: /25/ }).first().press('Enter')
    await expect.poll(() => week.inputValue()).toBe('Mon 23 Nov 2026')

    await page.locator('[data-test="add-override"]').click()
    const dialog = page.locator('[data-test="override-dialog"]')
    await dialog.waitFor()
    const from = dialog.locator('input[name="overrideStartsTime"]')
    expect(await from.inputValue()).toMatch(/^\d{1,2}:\d{2} [ap]m$/)
    await dialog.locator('input[name="overrideStarts"]').fill('3 Dec 2026')
    await from.fill('19:30')
    await from.press('Tab')
    expect(await dialog.locator('input[name="overrideStarts"]').inputValue()).toBe('Thu 3 Dec 2026')
    expect(await from.inputValue()).toBe('7:30 pm')
    await shot(page, 'date-field-override-desktop')
    await context.close()
  }, 120_000)

  it('fits a phone', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, reducedMotion: 'reduce' })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.owner.email)
    await openRoster(page)
    await shot(page, 'date-field-roster-phone')
    await page.locator('[data-test="add-override"]').click()
    await page.locator('[data-test="override-dialog"]').waitFor()
    await page.waitForTimeout(300)
    await shot(page, 'date-field-override-phone')
    expect(await page.evaluate('document.scrollingElement.scrollWidth <= innerWidth')).toBe(true)
    await context.close()
  }, 120_000)
})
