import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import { localDaysAgo, TANK_60 } from '../helpers/build-plan'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

// Planning a build of a 60 × 30 × 36 cm tank in the browser. The figures are the worked example
// of tests/unit/build: 47.5 L of water, a 75 W heater, 23.7 mL of conditioner, about 82 kg.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
const DAY_MS = 86_400_000
const ZONE = 'Europe/Berlin' // the fixture's first site

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Build Browser Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

// Every layer's select offers the same materials: the option is taken from the list this click
// opened, and the list is gone before the next step (a list still fading out, on a busy machine,
// would take the next layer's click).
async function choose(page: Page, field: ReturnType<Page['locator']>, option: RegExp) {
  await field.click()
  const list = page.locator('.v-overlay--active [role=listbox]').last()
  await list.getByRole('option', { name: option }).click()
  await list.waitFor({ state: 'hidden', timeout: FIRST_LOAD_MS })
}

async function addLayer(page: Page, index: number, material: RegExp | null, depth: string, bag?: string) {
  await page.locator('[data-test=add-layer]').click()
  const row = page.locator('[data-test=layer-row]').nth(index)
  if (material) await choose(page, row.locator('.v-select'), material)
  await row.locator(`input[name=layerDepth${index}]`).fill(depth)
  if (bag) await row.locator(`input[name=layerBag${index}]`).fill(bag)
}

/** A test-kit entry dated `daysAgo` days back: the server keeps its date, so the timeline can be ticked through cycling. */
const kit = (tankId: number, daysAgo: number, values: Record<string, number>) =>
  api(s, `/tanks/${tankId}/test-kit-entries`, org.users.keeper.token, {
    method: 'POST',
    body: JSON.stringify({
      takenAt: new Date(Date.now() - daysAgo * DAY_MS).toISOString(),
      values: Object.entries(values).map(([metric, value]) => ({ metric, value, unit: 'mg/L' })),
    }),
  })

describe('building a tank', () => {
  it('plans a 60 × 30 × 36 cm tank, ticks the timeline through cycling and adds the first fish with acclimation', async () => {
    const res = await api(s, '/tanks', org.users.owner.token, {
      method: 'POST',
      body: JSON.stringify(sampleTank(org.siteIds[0] as number, { name: 'Lounge 60', kind: 'planted', stage: 'empty', dimensions: TANK_60, heater: null })),
    })
    const tankId = res.body.id as number
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.locator('[data-test=tank-build-link]').click({ timeout: FIRST_LOAD_MS })
    await page.locator('[data-test=build-plan-form]').waitFor({ timeout: FIRST_LOAD_MS })

    await addLayer(page, 0, /Mineral base/, '1')
    await addLayer(page, 1, /Nutrient soil/, '4', '3')
    await addLayer(page, 2, null, '1', '2')
    await page.locator('[data-test=add-hardscape]').click()
    await page.locator('input[name=hardscapeKg0]').fill('5')
    await page.locator('[data-test=add-hardscape]').click()
    await choose(page, page.locator('[data-test=hardscape-row]').nth(1).locator('.v-select'), /Wood/)
    await page.locator('input[name=hardscapeKg1]').fill('1.1')
    await page.locator('[data-test=label-rate-toggle] input').check()
    await page.locator('input[name=startPh]').fill('7.6')
    await page.locator('[data-test=add-stage]').click()
    await page.locator('[data-test=stage-species] input[role=combobox]').fill('Harlequin')
    await page.getByRole('option', { name: /Harlequin rasbora/ }).click()

    const figures = page.locator('[data-test=build-figures]')
    // The figures follow the last typed field a moment later on a busy machine: wait for them to settle.
    await expect.poll(() => figures.locator('[data-test=figure-water]').innerText(), { timeout: 15_000 }).toBe('47.5 L')
    expect(await figures.locator('[data-test=figure-heater]').innerText()).toMatch(/^75 W suggested .*top between 6\.0 and 20\.0 cm/)
    expect(await figures.locator('[data-test=figure-conditioner]').innerText()).toBe('23.7 mL for 47.5 L')
    // Each figure follows its own fields (the weight the hardscape typed last): wait for each.
    await expect.poll(() => figures.locator('[data-test=figure-weight]').innerText(), { timeout: 15_000 }).toMatch(/^about 82 kg/)
    await expect.poll(() => figures.locator('[data-test=figure-layer]').nth(1).innerText(), { timeout: 15_000 }).toContain('7.2 L · 6.5 kg · 3 bags')
    expect(await figures.locator('[data-test=caution-weight]').innerText()).toContain('ask a structural engineer when unsure')
    expect(await figures.locator('[data-test=caution-electric]').innerText()).toContain('RCD/GFCI')
    expect(await figures.locator('[data-test=caution-label]').innerText()).toContain('follow the product label')
    // The planted tank's default target (22–28 °C) reaches past the harlequin's usual range (species table, from memory).
    // The figures follow the form after a short pause: wait for the chosen species to reach them.
    await expect
      .poll(() => figures.locator('[data-test=stocking-check]').allInnerTexts(), { timeout: 15_000 })
      .toEqual(["The tank's target 22–28 °C reaches outside the usual 22–27 °C for Harlequin rasbora"])

    await page.locator('[data-test=save-plan]').click()
    await page.locator('[data-test=build-notice]').waitFor()
    await shot(page, 'build-plan-desktop')
    const tank = (await api(s, `/tanks/${tankId}`, org.users.keeper.token)).body
    expect(tank.substrateDepthCm).toBe(6)
    expect(tank.heater).toEqual({ watts: 75, setPointC: 26, topCm: 20 })

    // Filled ten days ago: build day 11 of about 28.
    await page.locator('input[name=filledOn]').fill(localDaysAgo(ZONE, 10))
    await page.locator('[data-test=start-build]').click()
    const timeline = page.locator('[data-test=build-timeline]')
    await timeline.locator('[data-test=build-day]').waitFor()
    expect(await timeline.locator('[data-test=build-day]').innerText()).toBe('Build day 11 of about 28')
    // The wall tile says where the build stands.
    const wall = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(wall, s.baseUrl, org.users.keeper.email)
    await wall.goto(`${s.baseUrl}/wall/${org.siteIds[0]}`)
    const buildLine = wall.getByRole('article', { name: /^Lounge 60:/ }).locator('[data-test=tile-build-day]')
    await buildLine.waitFor({ timeout: FIRST_LOAD_MS })
    expect((await buildLine.innerText()).trim()).toBe('Build day 11 of about 28')
    await shot(wall, 'build-wall-tile')
    await wall.close()

    for (const key of ['conditioner', 'heater_check', 'ph', 'plants']) {
      await timeline.locator(`[data-test=tick-${key}]`).click()
      await timeline.locator(`[data-test=step-${key}] .mdi-checkbox-marked-circle`).waitFor()
    }

    await timeline.locator('[data-test=tick-cycling]').click()
    await timeline.locator('[data-test=timeline-error]').waitFor()
    expect(await timeline.locator('[data-test=timeline-error]').innerText()).toContain('have not yet read zero on two tests in a row')
    expect((await kit(tankId, 6, { ammonia: 2, nitrite: 1 })).status).toBe(201)
    expect((await kit(tankId, 2, { ammonia: 0, nitrite: 0, nitrate: 10 })).status).toBe(201)
    expect((await kit(tankId, 1, { ammonia: 0, nitrite: 0, nitrate: 15 })).status).toBe(201)
    await timeline.locator('[data-test=tick-cycling]').click()
    await timeline.locator('[data-test=step-cycling] .mdi-checkbox-marked-circle').waitFor()
    expect((await api(s, `/tanks/${tankId}`, org.users.keeper.token)).body.stage).toBe('established')

    await timeline.locator('[data-test=stock-stock_1]').click()
    await page.locator('input[name=bagLitres]').fill('1')
    await page.locator('input[name=bagTemp]').fill('24')
    await page.locator('input[name=bagPh]').fill('7.4')
    await page.locator('[data-test=stock-confirm]').click()
    const acclimation = timeline.locator('[data-test=acclimation-result]')
    await acclimation.waitFor()
    expect(await acclimation.innerText()).toContain('6 × Harlequin rasbora added: acclimation')
    expect(await acclimation.locator('tbody tr').count()).toBeGreaterThan(1)
    expect(await acclimation.innerText()).toContain('Net them across at minute')
    await timeline.locator('[data-test=step-stock_1] .mdi-checkbox-marked-circle').waitFor()
    await shot(page, 'build-timeline-desktop')

    // The only stage is in, so the build is finished: the next tank of the same size starts from its plan.
    const next = await api(s, '/tanks', org.users.owner.token, {
      method: 'POST',
      body: JSON.stringify(
        sampleTank(org.siteIds[0] as number, { name: 'Lounge 60 (second)', kind: 'planted', stage: 'empty', dimensions: TANK_60, heater: null }),
      ),
    })
    await page.goto(`${s.baseUrl}/tanks/${next.body.id}/build`)
    await page.locator('[data-test=use-template]').click({ timeout: FIRST_LOAD_MS })
    await page.locator('[data-test=build-figures] [data-test=figure-water]', { hasText: '47.5 L' }).waitFor()
    expect(await page.locator('[data-test=layer-row]').count()).toBe(3)
    await page.goBack()
    await page.locator('[data-test=build-timeline]').waitFor({ timeout: FIRST_LOAD_MS })

    const livestock = (await api(s, `/tanks/${tankId}/livestock`, org.users.keeper.token)).body
    expect(livestock.entries.map((e: { speciesKey: string; count: number }) => [e.speciesKey, e.count])).toEqual([['harlequin_rasbora', 6]])

    await page.setViewportSize({ width: 390, height: 844 })
    await page.locator('[data-test=build-figures]').scrollIntoViewIfNeeded()
    await shot(page, 'build-figures-phone')
    await page.getByRole('heading', { name: 'Build: Lounge 60' }).scrollIntoViewIfNeeded()
    await shot(page, 'build-top-phone')
    await page.setViewportSize({ width: 1280, height: 800 })
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('[data-test=save-plan]').isVisible()).toBe(false)
    await shot(page, 'build-print')
    await page.close()
  })
})
