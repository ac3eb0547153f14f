import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, shot, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'
import { audit, newContext, SIZE_THEMES } from './a11y-pages'

// A fresh installation: an empty database, no demo. Everything below goes through the screens,
// except the device's reading, which arrives over HTTP with the device's own token as a sensor's would.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let page: Page
const OWNER = { business: 'Blue Hollow Aquatics', name: 'Ines Varga', email: 'ines@blue-hollow.example', password: 'a-long-enough-password' }
const TANK = 'Show tank 1'

beforeAll(async () => {
  s = await startAppForBrowser()
  expect(await s.ctx.models.Organization.count()).toBe(0)
  b = await launchBrowser()
  browser = b.browser
  page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const checklistStep = (step: string) => page.locator(`[data-test="checklist-${step}"]`)

describe('a business starting for real', () => {
  // The setup page exists only before a business does, so it is audited here (tests/e2e/audited-routes.ts).
  it('shows a setup page that meets WCAG 2.1 AA, light and dark, desktop and phone', async () => {
    const found: string[] = []
    for (const [size, theme] of SIZE_THEMES) {
      const context = await newContext(browser, size, theme)
      const audited = await context.newPage()
      expect(await audit(audited, `${size}-${theme}`, `${s.baseUrl}/setup`, found)).toBe('setup')
      await context.close()
    }
    expect(found).toEqual([])
  })

  it('asks another machine for the printed code and refuses it without', async () => {
    // Through a proxy TRUST_PROXY does not name, the caller counts as another machine.
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, extraHTTPHeaders: { 'x-forwarded-for': '203.0.113.40' } })
    const stranger = await context.newPage()
    await stranger.goto(`${s.baseUrl}/setup`, { timeout: FIRST_LOAD_MS })
    await stranger.getByLabel('Setup code').fill('ABCD-EFGH', { timeout: FIRST_LOAD_MS })
    await stranger.getByLabel('Business name').fill('Claimed from afar')
    await stranger.getByLabel('Your name').fill('Stranger')
    await stranger.getByLabel('E-mail').fill('stranger@elsewhere.example')
    await stranger.getByLabel('Password').fill('a-long-enough-password')
    await stranger.getByLabel('First site').fill('Anywhere')
    await stranger.getByRole('button', { name: 'Set up and sign in' }).click()
    expect(await stranger.locator('[data-test="setup-error"]').textContent({ timeout: FIRST_LOAD_MS })).toContain('not the setup code the server printed')
    await shot(stranger, 'setup-code-refused-phone')
    expect(stranger.url()).toMatch(/\/setup$/)
    await context.close()
    expect(await s.ctx.models.Organization.count()).toBe(0)
  })

  it('opens the setup page on an empty installation and signs the owner in', async () => {
    await page.goto(`${s.baseUrl}/`, { timeout: FIRST_LOAD_MS })
    await page.waitForURL((url) => url.pathname === '/setup', { timeout: FIRST_LOAD_MS })
    await page.getByLabel('Business name').fill(OWNER.business, { timeout: FIRST_LOAD_MS })
    // On the server's own machine no setup code is asked for.
    expect(await page.getByLabel('Setup code').count()).toBe(0)
    const phone = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await phone.goto(`${s.baseUrl}/setup`, { timeout: FIRST_LOAD_MS })
    await phone.getByLabel('Business name').waitFor({ timeout: FIRST_LOAD_MS })
    await shot(phone, 'setup-phone')
    await phone.close()

    await page.getByLabel('Your name').fill(OWNER.name)
    await page.getByLabel('E-mail').fill(OWNER.email)
    await page.getByLabel('Password').fill(OWNER.password)
    await page.getByLabel('First site').fill('Back room')
    await shot(page, 'setup-desktop')
    await page.getByRole('button', { name: 'Set up and sign in' }).click()
    await page.waitForURL((url) => url.pathname === '/', { timeout: FIRST_LOAD_MS })
    await page.locator('[data-test="checklist"]').waitFor({ timeout: FIRST_LOAD_MS })
    await shot(page, 'setup-checklist-desktop')
    const site = (await s.ctx.models.Site.findAll())[0]!
    // The browser's zone is the default; headless Chromium here reports the machine's.
    expect(site.timeZone).toBe(await page.evaluate(() => Intl.DateTimeFormat().resolvedOptions().timeZone))
    expect(await checklistStep('tanks').getAttribute('data-done')).toBe('false')
  })

  it('adds a tank from the checklist', async () => {
    await checklistStep('tanks').getByRole('link', { name: 'New tank' }).click()
    await page.waitForURL((url) => url.pathname === '/tanks/new')
    await page.getByLabel('Name', { exact: true }).fill(TANK, { timeout: FIRST_LOAD_MS })
    await page.getByLabel('Length').fill('100')
    await page.getByLabel('Width (front to back)').fill('40')
    await page.getByLabel('Height', { exact: true }).fill('50')
    await page.getByLabel('Heater power').fill('150')
    await page.getByLabel('Heater top above the tank floor').fill('30')
    await page.getByRole('button', { name: 'Add tank' }).click()
    await page.waitForURL((url) => /^\/tanks\/\d+$/.test(url.pathname), { timeout: FIRST_LOAD_MS })
    expect((await s.ctx.models.Tank.findAll()).map((t) => t.name)).toEqual([TANK])
  })

  it("imports more tanks from a sheet, the checklist's other way to add them", async () => {
    await page.goto(`${s.baseUrl}/`, { timeout: FIRST_LOAD_MS })
    await checklistStep('tanks').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await checklistStep('tanks').getAttribute('data-done')).toBe('true')
    await page.goto(`${s.baseUrl}/tanks?import=1`, { timeout: FIRST_LOAD_MS })
    const dialog = page.locator('[data-test="tank-import-dialog"]')
    await dialog.waitFor({ timeout: FIRST_LOAD_MS })
    const sheet = 'name,site,kind,volume,set point\nSales row A1,Back room,tropical freshwater,96,25\nSales row A2,Back room,tropical freshwater,96,25\n'
    await dialog.locator('input[type=file]').setInputFiles({ name: 'tanks.csv', mimeType: 'text/csv', buffer: Buffer.from(sheet) })
    await shot(page, 'setup-import-tanks-desktop')
    await dialog.getByRole('button', { name: 'Add the tanks' }).click()
    expect(await page.locator('[data-test="tanks-imported"]').textContent({ timeout: FIRST_LOAD_MS })).toContain('Added 2 tanks.')
    const tanks = await s.ctx.models.Tank.findAll({ order: [['id', 'ASC']] })
    expect(tanks.map((t) => t.name)).toEqual([TANK, 'Sales row A1', 'Sales row A2'])
    expect(tanks.slice(1).map((t) => [t.kind, t.volumeLitres, t.heater?.setPointC])).toEqual([
      ['tropical_freshwater', 96, 25],
      ['tropical_freshwater', 96, 25],
    ])
  })

  let deviceToken = ''
  it('registers a device from the checklist, shown its MQTT and HTTP examples with the token once, and a reading arrives', async () => {
    await page.goto(`${s.baseUrl}/`, { timeout: FIRST_LOAD_MS })
    await checklistStep('device').getByRole('link', { name: 'Devices of your first tank' }).click({ timeout: FIRST_LOAD_MS })
    await page.waitForURL((url) => /^\/tanks\/\d+$/.test(url.pathname), { timeout: FIRST_LOAD_MS })
    await page.locator('[data-test="register-device"]').click({ timeout: FIRST_LOAD_MS })
    await page.getByLabel('Name, e.g. Probe node 4').fill('Back room probe 1')
    // Temperature is what a new device measures unless told otherwise.
    await page.getByRole('button', { name: 'Register', exact: true }).click()
    const token = page.locator('[data-test="device-token"] input')
    await token.waitFor({ timeout: FIRST_LOAD_MS })
    deviceToken = await token.inputValue()
    expect(deviceToken.length).toBeGreaterThan(20)
    expect(await page.locator('[data-test="device-example"]').textContent()).toContain(`-P '${deviceToken}'`)
    expect(await page.locator('[data-test="device-http-example"]').textContent()).toContain(`Bearer ${deviceToken}`)
    await shot(page, 'setup-device-token-desktop')
    await page.getByRole('button', { name: 'I have saved the token' }).click()
    // Once: the page never shows the token again.
    expect(await page.locator('[data-test="device-token"]').count()).toBe(0)
    expect(await page.content()).not.toContain(deviceToken)
    const res = await fetch(`${s.baseUrl}/api/v1/readings`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${deviceToken}` },
      body: JSON.stringify({ v: 1, readings: [{ metric: 'temperature', value: 25.4, time: new Date().toISOString() }] }),
    })
    expect(res.status).toBe(200)
    expect(((await res.json()) as { accepted: number }).accepted).toBe(1)
  })

  it('sets a duty shift from the checklist', async () => {
    await page.goto(`${s.baseUrl}/`, { timeout: FIRST_LOAD_MS })
    await checklistStep('roster').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await checklistStep('tanks').getAttribute('data-done')).toBe('true')
    expect(await checklistStep('device').getAttribute('data-done')).toBe('true')
    await checklistStep('roster').getByRole('link', { name: 'Duty roster' }).click()
    await page.locator('[data-test="add-shift"]').click({ timeout: FIRST_LOAD_MS })
    const dialog = page.locator('[data-test="shift-dialog"]')
    await dialog.locator('.v-select').first().click()
    await page.getByRole('option', { name: OWNER.name }).click()
    await dialog.getByRole('button', { name: 'Save shift' }).click()
    await dialog.waitFor({ state: 'hidden', timeout: FIRST_LOAD_MS })
    expect(await s.ctx.models.DutyShift.count()).toBe(1)
  })

  it('opens the wall from the checklist and sees the tank with its reading', async () => {
    await page.goto(`${s.baseUrl}/`, { timeout: FIRST_LOAD_MS })
    await checklistStep('wall').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await checklistStep('roster').getAttribute('data-done')).toBe('true')
    await shot(page, 'setup-checklist-progress-desktop')
    await checklistStep('wall').getByRole('link', { name: 'Open the wall' }).click()
    await page.waitForURL((url) => /^\/wall\/\d+$/.test(url.pathname), { timeout: FIRST_LOAD_MS })
    const tile = page.getByRole('article', { name: new RegExp(`^${TANK}:`) })
    await tile.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await tile.locator('[data-test=tile-temperature]').textContent()).toContain('25.4')
    await shot(page, 'setup-wall-desktop')
  })

  it('refuses a second setup, over HTTP and on the page', async () => {
    const res = await fetch(`${s.baseUrl}/api/v1/setup`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({
        businessName: 'Intruder',
        ownerName: 'X',
        email: 'x@intruder.example',
        password: 'another-long-password',
        siteName: 'Y',
        timeZone: 'UTC',
      }),
    })
    expect(res.status).toBe(409)
    const stranger = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await stranger.goto(`${s.baseUrl}/setup`, { timeout: FIRST_LOAD_MS })
    await stranger.waitForURL((url) => url.pathname === '/sign-in', { timeout: FIRST_LOAD_MS })
    await stranger.close()
    expect(await s.ctx.models.Organization.count()).toBe(1)
  })
})
