import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAINS_CAUTION } from '@shared/equipment/defaults'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { go, LookAuditor } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

// A batch moved from quarantine into a tank with an open incident and softer water (the
// half-unit pH gap is `common practice`), and the equipment list of a tank with a lamp past its
// yearly change (`common practice`). Counts and names are made up.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let quarantine: number
let sales: number
let batchId: number
const SIZES = { desktop: { width: 1280, height: 800 }, phone: { width: 390, height: 844 } } as const

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Stock Browser Org')
  quarantine = await newTank('Quarantine 3', { stage: 'quarantine', targets: { ph: { min: 7.6, max: 8.0 } } })
  sales = await newTank('Sales 5', { targets: { ph: { min: 6.2, max: 6.6 } } })
  const at = new Date()
  await s.ctx.models.Incident.create({
    organizationId: org.organizationId,
    siteId: org.siteIds[0] as number,
    tankId: sales,
    ruleId: null,
    ruleKind: 'above',
    metric: 'temperature',
    severity: 'warning',
    title: 'Temperature above 28 °C',
    state: 'open',
    conditionSince: at,
    openedAt: at,
    firstValue: 28.4,
    peakValue: 28.4,
    latestValue: 28.4,
    latestAt: at,
  })
  const added = await api(s, `/tanks/${quarantine}/livestock`, org.users.keeper.token, {
    method: 'POST',
    body: JSON.stringify({ speciesKey: 'zebra_danio', count: 20, source: 'Test wholesaler' }),
  })
  batchId = added.body.entry.id
  const zone = (await s.ctx.models.Site.findByPk(org.siteIds[0]))!.timeZone
  const today = localDateAt(zone, Date.now())
  const lampDay = formatLocalDate({ year: today.year - 1, month: today.month, day: Math.min(today.day, 28) })
  const lamp = { kind: 'lamp', name: 'Front lamp', model: 'T5 tube 895 mm', watts: 39, installedOn: lampDay }
  const heater = { kind: 'heater', name: 'Main heater', model: 'Glass heater', watts: 200, installedOn: formatLocalDate(today) }
  for (const piece of [lamp, heater]) {
    const res = await api(s, `/tanks/${sales}/equipment`, org.users.keeper.token, { method: 'POST', body: JSON.stringify(piece) })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
  }
  await api(s, `/sites/${org.siteIds[0]}/consumables`, org.users.keeper.token, {
    method: 'POST',
    body: JSON.stringify({ kind: 'reagent', name: 'Nitrite reagent', unit: 'ml', quantity: 20, lowAt: 5, expiresOn: '2026-01-31' }),
  })
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function newTank(name: string, overrides: Record<string, unknown> = {}) {
  const res = await api(s, '/tanks', org.users.owner.token, {
    method: 'POST',
    body: JSON.stringify(sampleTank(org.siteIds[0] as number, { name, ...overrides })),
  })
  if (res.status !== 201) throw new Error(`tank ${name}: ${res.status} ${JSON.stringify(res.body)}`)
  return res.body.id as number
}

/** Opens the move dialog of the batch and asks to move `count` into Sales 5: the warnings come back. */
async function askToMove(page: Page, count: string) {
  await page.goto(`${s.baseUrl}/tanks/${quarantine}`)
  await page.locator(`[data-test=livestock-move-${batchId}]`).click({ timeout: FIRST_LOAD_MS })
  const dialog = page.locator('[data-test=batch-move-dialog]')
  await dialog.locator('[data-test=batch-move-target] input').fill('Sales 5')
  await page.getByRole('option', { name: /^Sales 5/ }).click()
  await dialog.locator('[data-test=batch-move-count] input').fill(count)
  await dialog.locator('[data-test=batch-move-save]').click()
  await dialog.locator('[data-test=batch-move-warnings]').waitFor()
  return dialog
}

describe('moving a batch between tanks', () => {
  it('shows the target tank’s trouble first and moves only when the keeper goes ahead', async () => {
    const page = await browser.newPage({ viewport: SIZES.desktop })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const dialog = await askToMove(page, '12')
    const warnings = await dialog.locator('[data-test=batch-move-warning]').allInnerTexts()
    expect(warnings[0]).toBe('Sales 5 has an open incident: Temperature above 28 °C')
    expect(warnings[1]).toMatch(/^pH 7\.8 here, 6\.4 in Sales 5 \(1\.4 apart\)/)
    expect(await dialog.locator('[data-test=batch-move-save]').innerText()).toBe('Move anyway')
    // Nothing has moved yet.
    expect((await api(s, `/livestock/batches/${batchId}`, org.users.keeper.token)).body.alive).toBe(20)
    await shot(page, 'batch-move-warning-desktop')

    const moved = page.waitForResponse((r) => r.url().endsWith(`/livestock/batches/${batchId}/move`) && r.status() === 200)
    await dialog.locator('[data-test=batch-move-save]').click()
    await moved
    await expect.poll(() => page.locator(`[data-test=livestock-${batchId}]`).innerText()).toContain('8 in the tank')
    expect(await page.locator(`[data-test=livestock-${batchId}]`).innerText()).toContain('12 moved on')
    const batch = (await api(s, `/livestock/batches/${batchId}`, org.users.keeper.token)).body
    expect(batch).toMatchObject({ alive: 8, movedOut: 12 })
    await shot(page, 'batch-moved-desktop')

    // The batch's way through the tanks, on the Livestock screen.
    await page.goto(`${s.baseUrl}/livestock`)
    await page.locator('[data-test=stock-table]').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('[data-test=stock-row]').allInnerTexts()).toEqual(expect.arrayContaining([expect.stringMatching(/^Quarantine 3\s/)]))
    const split = (await api(s, `/livestock/batches?tankId=${sales}`, org.users.keeper.token)).body[0]
    await page.locator(`[data-test=batch-${split.id}] button`).first().click()
    await page.locator(`[data-test=batch-${split.id}] [data-test=batch-history]`).waitFor()
    expect(await page.locator(`[data-test=batch-${split.id}]`).innerText()).toContain('Tanks: Quarantine 3 → Sales 5')
    await shot(page, 'livestock-desktop')
    await page.close()
  })

  it('shows the same warnings on a phone', async () => {
    const page = await browser.newPage({ viewport: SIZES.phone })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const dialog = await askToMove(page, '3')
    expect(await dialog.locator('[data-test=batch-move-warning]').count()).toBe(2)
    await shot(page, 'batch-move-warning-phone')
    await page.close()
  })
})

describe('equipment on a tank', () => {
  for (const size of ['desktop', 'phone'] as const) {
    it(`lists the lamp as due with the mains caution (${size})`, async () => {
      const page = await browser.newPage({ viewport: SIZES[size] })
      await signIn(page, s.baseUrl, org.users.keeper.email)
      await page.goto(`${s.baseUrl}/tanks/${sales}`)
      const panel = page.locator('[data-test=equipment-panel]')
      await panel.locator('[data-test=mains-caution]').waitFor({ timeout: FIRST_LOAD_MS })
      expect(await panel.locator('[data-test=mains-caution]').innerText()).toBe(MAINS_CAUTION)
      await panel.locator('.v-list-item[data-test^=equipment-]').first().waitFor()
      const items = await panel.locator('.v-list-item[data-test^=equipment-]').allInnerTexts()
      expect(items.find((t) => t.includes('Lamp: Front lamp'))).toMatch(/Due today|Overdue/i)
      expect(items.find((t) => t.includes('Heater: Main heater'))).toContain('Check every 30 days')
      await panel.scrollIntoViewIfNeeded()
      await shot(page, `equipment-${size}`)
      await page.close()
    })
  }
})

describe('the livestock and supplies screens meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context signed in once, a page per theme, each screen checked at both sizes (a11y-pages.ts).
  it('in both sizes and themes', async () => {
    const { context, auditor } = await LookAuditor.start(browser)
    await auditor.signIn(s.baseUrl, org.users.owner.email)
    for (const path of ['/livestock', `/supplies?site=${org.siteIds[0]}`]) await auditor.visit(path)
    await auditor.each((page) => go(page, `/tanks/${sales}`))
    await auditor.checkEveryLook('equipment', (page) => page.locator('[data-test=equipment-panel] .v-list-item').first())
    await auditor.overlay('batch-move-dialog', (page) => askToMove(page, '1'))
    await auditor.overlay('batch-out-dialog', (page) => page.locator(`[data-test=livestock-sell-${batchId}]`).click())
    await context.close()
    expect(auditor.found, auditor.found.join('\n\n')).toEqual([])
    expect([...auditor.visited].sort()).toEqual([...AUDITED_ROUTES['livestock-equipment.test.ts']!].sort())
  }, 300_000)
})
