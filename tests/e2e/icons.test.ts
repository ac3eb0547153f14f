import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, MINUTE_MS, postTemperatures, tankWithProbe, type App } from './keeper-setup'

// Icons are inline SVG paths of only the names the client uses (tooling/vite-mdi-icons.ts): an icon
// whose name is missing from the map would draw as an empty box, so every icon on these screens
// must carry a real path.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let siteId: number
let firstTankId: number

const SIZES = [
  { name: 'desktop', width: 1280, height: 800 },
  { name: 'phone', width: 390, height: 844 },
] as const

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Icon Org')
  siteId = org.siteIds[0]
  const owner = org.users.owner.token
  for (const [i, name] of ['Angelfish pair', 'Blue rams', 'Corydoras bay'].entries()) {
    const probe = await tankWithProbe(s, owner, siteId, name, i)
    if (i === 0) firstTankId = probe.tankId
    // An hour of readings, so each tile has a trend line to draw.
    const hour = Array.from({ length: 7 }, (_, k): [number, number] => [Date.now() - (60 - k * 10) * MINUTE_MS, 25 + i / 10 + (k % 3) / 10])
    expect(await postTemperatures(s, probe.token, hour)).toBe(7)
  }
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** Every Vuetify icon on the page whose SVG path is missing or empty, by its classes. */
function iconsWithoutPath(page: Page): Promise<string[]> {
  return page
    .locator('.v-icon')
    .evaluateAll((icons) => icons.filter((icon) => (icon.querySelector('svg path')?.getAttribute('d') ?? '').length < 10).map((icon) => icon.className))
}

describe('icons drawn as SVG paths', () => {
  it('a wall display draws its tiles with state icons and trend lines, and loads no icon font or chart library', async () => {
    const created = await api(s, `/sites/${siteId}/wall-credentials`, org.users.owner.token, { method: 'POST', body: JSON.stringify({ name: 'Icon TV' }) })
    expect(created.status).toBe(201)
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } })
    const page = await context.newPage()
    const requested: string[] = []
    page.on('request', (r) => requested.push(new URL(r.url()).pathname))
    await page.goto(`${s.baseUrl}${created.body.link}`)
    const tiles = page.locator('[data-test=wall-grid] article')
    await tiles.nth(2).waitFor({ timeout: FIRST_LOAD_MS })
    await page.waitForLoadState('networkidle')

    expect(await tiles.count()).toBe(3)
    for (let i = 0; i < 3; i++) {
      const stateIcon = tiles.nth(i).locator('[data-test=tile-state-icon] svg path')
      expect((await stateIcon.getAttribute('d'))?.length).toBeGreaterThan(10)
      expect((await tiles.nth(i).locator('[data-test=tile-trend] path').first().getAttribute('d'))?.startsWith('M')).toBe(true)
    }
    // The state icon keeps its name as a class, as the icon font did.
    expect(await tiles.first().locator('[data-test=tile-state-icon]').getAttribute('class')).toMatch(/\bmdi-[a-z-]+/)
    expect(await iconsWithoutPath(page)).toEqual([])
    expect(requested.filter((path) => /materialdesignicons|echarts|\.(woff|ttf|eot)$/.test(path))).toEqual([])
    await shot(page, 'icons-wall-1920')
    await context.close()
  })

  for (const size of SIZES) {
    it(`the tanks list and a tank page show every icon at ${size.name} size`, async () => {
      const page = await browser.newPage({ viewport: { width: size.width, height: size.height } })
      await signIn(page, s.baseUrl, org.users.keeper.email)
      await page.goto(`${s.baseUrl}/tanks`)
      await page.locator('[data-test=tank-row]').nth(2).waitFor({ timeout: FIRST_LOAD_MS })
      expect(await page.locator('[data-test=tank-state-icon] svg path').count()).toBe(3)
      expect(await iconsWithoutPath(page)).toEqual([])
      await shot(page, `icons-tanks-${size.name}`)

      await page.goto(`${s.baseUrl}/tanks/${firstTankId}`)
      await page.getByRole('heading', { name: 'Angelfish pair' }).first().waitFor({ timeout: FIRST_LOAD_MS })
      await page.waitForLoadState('networkidle')
      expect(await page.locator('.v-icon').count()).toBeGreaterThan(3)
      expect(await iconsWithoutPath(page)).toEqual([])
      await shot(page, `icons-tank-${size.name}`)
      await page.close()
    })
  }
})
