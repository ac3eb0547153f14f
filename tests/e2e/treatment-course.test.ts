import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { COURSE_CAUTIONS } from '@shared/care/treatment'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

// A quarantine tank of 100 L entered by hand; a label's 1 mL per 10 L comes to 10 mL a dose.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Treatment Browser Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

describe('a treatment course on a quarantine tank', () => {
  it('starts from the tank page with the cautions shown, and its dose and tests appear in Care today', async () => {
    const res = await api(s, '/tanks', org.users.owner.token, {
      method: 'POST',
      body: JSON.stringify(sampleTank(org.siteIds[0] as number, { name: 'Quarantine Q1', stage: 'quarantine', dimensions: null, volumeLitres: 100 })),
    })
    expect(res.status).toBe(201)
    const tankId = res.body.id as number

    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    const panel = page.locator('[data-test=treatment-courses-panel]')
    await panel.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await panel.locator('[data-test=course-panel-cautions]').innerText()).toContain(COURSE_CAUTIONS[3])

    await panel.locator('[data-test=course-start]').click()
    const dialog = page.locator('.v-dialog', { hasText: 'Start a treatment course' })
    await dialog.waitFor()
    for (const caution of COURSE_CAUTIONS) expect(await dialog.locator('[data-test=course-cautions]').innerText()).toContain(caution)
    await dialog.locator('input[name=product]').fill('Copper treatment (label batch 7)')
    await dialog.locator('input[name=amount]').fill('1')
    await dialog.locator('input[name=perLitres]').fill('10')
    await dialog.locator('input[name=days]').fill('14')
    expect(await dialog.locator('[data-test=course-dose]').innerText()).toBe('For this tank’s 100 L: 10 mL a dose.')
    await dialog.locator('[data-test=course-test-metric] .v-field').click()
    await page.getByRole('option', { name: 'Copper' }).click()
    await dialog.locator('[data-test=course-test-times] .v-field').click()
    await page.getByRole('option', { name: '2 times a day' }).click()
    await dialog.locator('input[name=bandMin]').fill('0.15')
    await dialog.locator('input[name=bandMax]').fill('0.20')
    await shot(page, 'treatment-course-dialog-desktop')
    await dialog.locator('[data-test=course-save]').click()
    await dialog.waitFor({ state: 'hidden' })

    const state = panel.locator('[data-test=course-state]').first()
    await state.waitFor()
    expect(await state.innerText()).toBe('Running: day 1 of 14')
    expect(await panel.innerText()).toContain('10 mL for 100 L (label: 1 mL per 10 L), every day')
    expect(await panel.innerText()).toContain('Copper 2 times a day (label band 0.15 – 0.20 mg/L)')
    await panel.scrollIntoViewIfNeeded()
    await shot(page, 'treatment-course-panel-desktop')

    await page.goto(`${s.baseUrl}/care/today`)
    const list = page.locator('[data-test=care-today-list]')
    await list.waitFor({ timeout: FIRST_LOAD_MS })
    const titles = await list.locator('[data-test=care-task-title]').allInnerTexts()
    expect(titles).toEqual(
      expect.arrayContaining([
        'Dose Copper treatment (label batch 7): 10 mL for 100 L, as the label says',
        'Test copper (morning) during Copper treatment (label batch 7), label band 0.15–0.20 mg/L',
        'Test copper (evening) during Copper treatment (label batch 7), label band 0.15–0.20 mg/L',
      ]),
    )
    const note = list.locator('[data-test=care-task-course-note]', { hasText: 'Activated carbon removes most medications' })
    expect(await note.count()).toBe(1)
    await shot(page, 'treatment-course-care-today-desktop')

    await page.setViewportSize({ width: 390, height: 844 })
    await list.locator('[data-test=care-task-title]', { hasText: 'Dose Copper treatment' }).scrollIntoViewIfNeeded()
    await shot(page, 'treatment-course-care-today-phone')
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await panel.waitFor({ timeout: FIRST_LOAD_MS })
    await panel.scrollIntoViewIfNeeded()
    await shot(page, 'treatment-course-panel-phone')
    await page.close()
  })
})
