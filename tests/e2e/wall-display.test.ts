import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, readStorage, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let shopId: number
let shopName: string
let shopTankId: number
/** The link as the owner copied it, and the key inside it. */
let link = ''
let key = ''

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Display Org')
  shopId = org.siteIds[0]
  shopName = 'Display Org shop'
  const owner = org.users.owner.token
  const shopTank = await api(s, '/tanks', owner, { method: 'POST', body: JSON.stringify(sampleTank(shopId, { name: 'Shop window tank' })) })
  expect(shopTank.status).toBe(201)
  shopTankId = shopTank.body.id
  const roomTank = await api(s, '/tanks', owner, { method: 'POST', body: JSON.stringify(sampleTank(org.siteIds[1], { name: 'Fish room tub' })) })
  expect(roomTank.status).toBe(201)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** The display's wall is up: its site's name in the header and its one tank's tile. */
async function expectWall(page: Page, timeout = 15_000) {
  await page.waitForURL((url) => url.pathname === `/wall/${shopId}`, { timeout })
  await page.getByRole('article', { name: /^Shop window tank:/ }).waitFor({ timeout })
  expect((await page.locator('.tw-wall-head__site').textContent())?.trim()).toBe(shopName)
  expect(new URL(page.url()).search).toBe('')
}

describe('a wall display signed in with its own key', () => {
  it('lets the owner make a display link for one site on the Sites page', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } })
    await signIn(page, s.baseUrl, org.users.owner.email)
    await page.goto(`${s.baseUrl}/sites`)
    const panel = page.locator('[data-test=wall-displays]')
    await panel.waitFor({ timeout: FIRST_LOAD_MS })
    await panel.locator('.v-select .v-field').click()
    await page.getByRole('option', { name: shopName }).click()
    await panel.getByLabel('Display name, e.g. Fish room TV').fill('Shop TV')
    const created = page.waitForResponse((r) => r.url().endsWith(`/sites/${shopId}/wall-credentials`) && r.request().method() === 'POST')
    await panel.getByRole('button', { name: 'Create display link' }).click()
    expect((await created).status()).toBe(201)

    link = await panel.getByRole('textbox', { name: 'Display link' }).inputValue()
    const match = new RegExp(`^${s.baseUrl}/wall/${shopId}\\?key=(\\S+)$`).exec(link)
    expect(match).not.toBeNull()
    key = decodeURIComponent(match![1]!)
    await expect.poll(() => panel.locator('[data-test=wall-credentials]').textContent()).toMatch(/Shop TV.*last used never/)
    await shot(page, 'wall-display-link')
    await page.close()
  })

  it('opens the link once: the wall shows, the key leaves the address bar, a reload stays signed in', async () => {
    expect(key).not.toBe('')
    const display = await browser.newContext({ viewport: { width: 1920, height: 1080 } })
    const page = await display.newPage()
    await page.goto(link)
    await expectWall(page, FIRST_LOAD_MS)
    // Only the linked site: the other site's tank is not on it, and a display has no way out.
    expect(await page.getByRole('article', { name: /^Fish room tub:/ }).count()).toBe(0)
    expect(await page.getByRole('link', { name: /Leave wall/ }).count()).toBe(0)
    const stored = await readStorage(page, ['tw.wallKey', 'tw.wallSiteId', 'tw.token'])
    expect(stored).toEqual({ 'tw.wallKey': key, 'tw.wallSiteId': String(shopId), 'tw.token': null })

    await page.reload()
    await expectWall(page)
    await shot(page, 'wall-display-1920')

    // Any other page of the app sends the display back to its wall.
    for (const path of ['/tanks', '/sites', '/incidents', `/tanks/${shopTankId}`, `/wall/${org.siteIds[1]}`]) {
      await page.goto(`${s.baseUrl}${path}`)
      await expectWall(page)
      expect(await page.getByText('Fish room tub').count()).toBe(0)
    }
    await page.close()
    await display.close()

    await expect
      .poll(async () => {
        const list = await api(s, `/sites/${shopId}/wall-credentials`, org.users.owner.token)
        return list.body.find((c: { name: string }) => c.name === 'Shop TV')?.lastUsedAt ?? null
      })
      .not.toBeNull()
  })

  it('answers 401 to the key everywhere but its own wall', async () => {
    expect(key).not.toBe('')
    const own = await api(s, `/sites/${shopId}/wall`, key)
    expect(own.status).toBe(200)
    expect(own.body.tanks.map((t: { name: string }) => t.name)).toEqual(['Shop window tank'])
    for (const path of ['/tanks', `/tanks/${shopTankId}`, '/sites', '/incidents', '/devices', '/users', `/sites/${shopId}/wall-credentials`]) {
      const answer = await api(s, path, key)
      expect([path, answer.status]).toEqual([path, 401])
    }
    const write = await api(s, '/tanks', key, { method: 'POST', body: JSON.stringify(sampleTank(shopId, { name: 'Sneaky' })) })
    expect(write.status).toBe(401)
    expect((await api(s, `/sites/${org.siteIds[1]}/wall`, key)).status).toBe(404)
  })
})
