import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { NIGHT, seedNight } from '../helpers/overview-night'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let night: Awaited<ReturnType<typeof seedNight>>
const ORG = 'Overview Shop'
const KEEPER = `keeper of ${ORG}`
const OWNER = `owner of ${ORG}`

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg(ORG)
  night = await seedNight(s.ctx, org, new Date())
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const card = (page: Page) => page.locator(`[data-test="overview-site-${org.siteIds[0]}"]`)
const lines = (page: Page, name: string) => card(page).locator(`[data-test="${name}"]`).allInnerTexts()

async function openOverview(width: number, height: number) {
  const page = await browser.newPage({ viewport: { width, height } })
  await signIn(page, s.baseUrl, org.users.owner.email)
  await page.waitForURL((url) => url.pathname === '/', { timeout: FIRST_LOAD_MS })
  await card(page).locator('[data-test="overview-incident"]').first().waitFor({ timeout: FIRST_LOAD_MS })
  return page
}

describe("the owner's overview", () => {
  it("is the owner's home after sign-in and tells the night, today and the tank states", async () => {
    const page = await openOverview(1280, 800)
    await shot(page, 'overview-desktop')
    await card(page).scrollIntoViewIfNeeded()
    await shot(page, 'overview-site-desktop')
    expect(await card(page).locator('[data-test="overview-since"]').innerText()).toMatch(/18:00 is assumed/)

    const incidents = await lines(page, 'overview-incident')
    expect(incidents).toHaveLength(3)
    expect(incidents[0]).toContain(NIGHT.titles.heater)
    expect(incidents[0]).toContain(`acknowledged by ${KEEPER} after ${NIGHT.ackMinutes.heater} min`)
    expect(incidents[0]).toContain('resolved')
    expect(incidents[1]).toContain(`acknowledged by ${OWNER} after ${NIGHT.ackMinutes.quiet} min`)
    expect(incidents[2]).toContain(NIGHT.titles.ph)
    expect(incidents[2]).toContain('not acknowledged')
    expect(incidents[2]).toContain('still open')
    expect(await card(page).locator('[data-test="overview-incident-count"]').innerText()).toBe('3 incidents opened, 2 still open')

    const quiet = await lines(page, 'overview-quiet')
    expect(quiet.map((l) => l.split(':')[0])).toEqual([NIGHT.tanks.reef1, NIGHT.tanks.reef3])
    expect(quiet[1]).toContain('quiet now')
    expect(await lines(page, 'overview-care-missed')).toEqual([expect.stringContaining(`${NIGHT.care.missed} on ${NIGHT.tanks.reef1}`)])
    expect(await lines(page, 'overview-kit-overdue')).toEqual([expect.stringContaining(`${NIGHT.tanks.reef2}: ${NIGHT.care.kit}`)])
    expect(await lines(page, 'overview-water-change')).toEqual([expect.stringContaining(`${NIGHT.tanks.reef2} at`)])
    expect((await lines(page, 'overview-water-change'))[0]).toContain(`by ${KEEPER}`)

    expect(await card(page).locator('[data-test="overview-on-duty"]').innerText()).toContain(KEEPER)
    expect(await lines(page, 'overview-care-due')).toEqual([`${NIGHT.care.today} on ${NIGHT.tanks.reef2}`])
    expect(await lines(page, 'overview-quarantine')).toEqual([`${NIGHT.tanks.quarantine}: quarantine day ${NIGHT.quarantineDaysIn + 1} of 28`])

    const strip = card(page).locator('[data-test="overview-strip"]')
    for (const state of ['watch', 'alarm', 'quiet', 'no_sensor']) {
      expect(await strip.locator(`[data-test="strip-${state}"]`).getAttribute('data-count')).toBe('1')
    }
    expect(await strip.locator('[data-test="strip-steady"]').getAttribute('data-count')).toBe('0')
    // The same chips and words as the wall and the tanks list.
    expect(await strip.locator('[data-test="tank-state"]').allInnerTexts()).toEqual(['ALARM', 'WATCH', 'QUIET', 'NO SENSOR', 'STEADY'])
    await page.close()
  })

  it("follows an acknowledgement live, and its strip opens the site's wall", async () => {
    const page = await openOverview(390, 844)
    await shot(page, 'overview-phone')
    await card(page).scrollIntoViewIfNeeded()
    await shot(page, 'overview-site-phone')
    const open = await api(s, `/incidents?tankId=${night.tankIds.reef2}`, org.users.keeper.token)
    const incidentId = open.body.items[0].id as number
    const ack = await api(s, `/incidents/${incidentId}/acknowledge`, org.users.keeper.token, {
      method: 'POST',
      body: JSON.stringify({ note: 'Dosing buffer' }),
    })
    expect(ack.status).toBe(200)
    await expect.poll(async () => (await lines(page, 'overview-incident'))[2], { timeout: 20_000 }).toContain(`acknowledged by ${KEEPER} after`)
    await card(page).locator('[data-test="overview-strip"]').click()
    await page.waitForURL((url) => url.pathname === `/wall/${org.siteIds[0]}`, { timeout: FIRST_LOAD_MS })
    await page.close()
  })

  it("is not a viewer's home: a viewer still lands on the tanks", async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.viewer.email)
    await page.waitForURL((url) => url.pathname === '/tanks', { timeout: FIRST_LOAD_MS })
    await page.close()
  })
})
