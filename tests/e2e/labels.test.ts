import { readFile } from 'node:fs/promises'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { TEST_PASSWORD } from '../helpers/fixtures'
import { checkPage, newContext, open, SIZES } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, type App } from './keeper-setup'

// The labels screen is audited with axe-core against WCAG 2.1 A and AA (Web Content Accessibility
// Guidelines 2.1, W3C, 2018) at desktop and phone sizes, like the other screens.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let siteId: number
const tanks: Record<string, number> = {}
const visited = new Set<string>()

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Driftwood Aquatics')
  siteId = org.siteIds[0]!
  for (const name of ['Betta wall 1', 'Betta wall 2', 'Coldwater 4', 'Retired tub']) {
    tanks[name] = (await tankWithProbe(s, org.users.owner.token, siteId, name)).tankId
  }
  const archived = await api(s, `/tanks/${tanks['Retired tub']}/archive`, org.users.owner.token, { method: 'POST', body: '{}' })
  expect(archived.status).toBe(200)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** The link printed on a label (the configured public address), and the same page on the test server. */
const linkOf = (tankId: number) => `${s.ctx.config.publicUrl}/tanks/${tankId}/test-kit`
const openedAt = (tankId: number) => `${s.baseUrl}/tanks/${tankId}/test-kit`

describe('tank labels', () => {
  it('lets an owner pick paper and size and download the sheet; the screen passes the audit at both sizes', async () => {
    const found: string[] = []
    for (const size of ['desktop', 'phone'] as const) {
      const context = await newContext(browser, size, 'light')
      const page = await context.newPage()
      await signIn(page, s.baseUrl, org.users.owner.email)
      await open(page, `${s.baseUrl}/sites`)
      await page.getByRole('button', { name: 'Tank labels for Driftwood Aquatics shop' }).click()
      await page
        .locator('[data-test="labels-tanks"]')
        .waitFor({ timeout: FIRST_LOAD_MS })
        .catch(async (error: unknown) => {
          await shot(page, `labels-failed-${size}`)
          throw error
        })
      expect(await page.locator('[data-test="labels-tanks"] li').allInnerTexts()).toEqual(['Betta wall 1', 'Betta wall 2', 'Coldwater 4'])
      expect(await page.locator('[data-test="labels-summary"]').innerText()).toBe('3 labels, 24 to a page · 1 page')
      await page.getByLabel('US letter (8.5 × 11 in)').check()
      await page.getByLabel('Large: 99 × 67 mm, 2 across').check()
      expect(await page.locator('[data-test="labels-summary"]').innerText()).toBe('3 labels, 8 to a page · 1 page')
      await page.waitForTimeout(300)
      const route = await checkPage(page, `labels-${size}`, found)
      if (route) visited.add(route)
      await shot(page, `labels-${size}`)
      if (size === 'desktop') {
        const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="labels-download"]').click()])
        expect(download.suggestedFilename()).toBe('tank-labels-driftwood-aquatics-shop-letter-large.pdf')
        const pdf = (await readFile((await download.path())!)).toString('latin1')
        expect(pdf.startsWith('%PDF-')).toBe(true)
        const uris = [...pdf.matchAll(/\/URI \(([^)]*)\)/g)].map((m) => m[1])
        expect(uris).toEqual([linkOf(tanks['Betta wall 1']!), linkOf(tanks['Betta wall 2']!), linkOf(tanks['Coldwater 4']!)])
      }
      await context.close()
    }
    expect(found).toEqual([])
  })

  it("opens a scanned label's link on a phone after sign-in, straight at the test-kit entry", async () => {
    const context = await browser.newContext({ viewport: SIZES.phone })
    const page = await context.newPage()
    await page.goto(openedAt(tanks['Coldwater 4']!), { timeout: FIRST_LOAD_MS })
    await page.waitForURL((url) => url.pathname === '/sign-in', { timeout: FIRST_LOAD_MS })
    await page.getByLabel('E-mail').fill(org.users.keeper.email, { timeout: FIRST_LOAD_MS })
    await page.getByLabel('Password', { exact: true }).fill(TEST_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((url) => url.pathname === `/tanks/${tanks['Coldwater 4']}/test-kit`, { timeout: FIRST_LOAD_MS })
    await page.locator('input[name="ph"]').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('h1').innerText()).toBe('Log test · Coldwater 4')
    await context.close()
  })

  it("says so on an archived tank's label", async () => {
    const context = await browser.newContext({ viewport: SIZES.phone })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(openedAt(tanks['Retired tub']!))
    await page.locator('[data-test="kit-archived"]').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('[data-test="kit-archived"]').innerText()).toContain('This tank is archived.')
    expect(await page.locator('input[name="ph"]').count()).toBe(0)
    await shot(page, 'labels-archived-phone')
    await context.close()
  })

  it('opened every route this file is listed as auditing', () => {
    expect([...visited].sort()).toEqual([...AUDITED_ROUTES['labels.test.ts']!].sort())
  })
})
