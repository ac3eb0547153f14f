import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { newSecretToken } from '../../server/access/tokens'
import { ackLinksService } from '../../server/incidents/ack-links'
import { createIncidentRow, type TestOrg } from '../helpers/fixtures'
import { audit, checkPage, newContext, open, SIZE_THEMES } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { launchBrowser, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, postTemperatures, tankWithProbe, type App } from './keeper-setup'

// The screens of forms, links from mails and the main dialogs, audited with axe-core against WCAG
// 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both themes, at
// desktop and phone sizes, like the main screens in accessibility.test.ts.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
const links = { invite: '', reset: '', ack: '' }

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Lanternfish Tank Care')
  const owner = org.users.owner.token
  const siteId = org.siteIds[0]!
  const post = (path: string, body: unknown) => api(s, path, owner, { method: 'POST', body: JSON.stringify(body) })
  const probe = await tankWithProbe(s, owner, siteId, 'Quarantine 2')
  tankId = probe.tankId
  const now = Date.now()
  expect(
    await postTemperatures(s, probe.token, [
      [now - 20 * 60_000, 25.4],
      [now - 10 * 60_000, 25.6],
      [now, 25.5],
    ]),
  ).toBe(3)
  expect((await post(`/tanks/${tankId}/test-kit-entries`, { values: [{ metric: 'ph', value: 7.1, unit: 'pH' }] })).status).toBe(201)

  const invite = await post('/users/invitations', { email: 'new.keeper@lanternfish.invalid', name: 'Robin Alder', role: 'keeper' })
  expect(invite.status, JSON.stringify(invite.body)).toBe(201)
  links.invite = `${s.baseUrl}${invite.body.link as string}`

  const { token, hash } = newSecretToken()
  await s.ctx.sequelize.query(`INSERT INTO password_resets (user_id, token_hash, expires_at) VALUES ($1, $2, now() + interval '1 hour')`, {
    bind: [org.users.keeper.id, hash],
  })
  links.reset = `${s.baseUrl}/reset-password?token=${token}`

  const incident = await createIncidentRow(s.ctx, org, tankId, { siteId, title: 'Temperature above 28 °C', firstValue: 28.4 })
  const ack = new URL(await ackLinksService(s.ctx).create(incident.id, org.users.keeper.id))
  links.ack = `${s.baseUrl}${ack.pathname}${ack.search}`
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** Opens a dialog with `trigger`, checks the page with it open, and closes it again with Cancel or Escape. */
async function auditDialog(page: Page, label: string, trigger: () => Promise<void>, found: string[]) {
  await trigger()
  const dialog = page.locator('.v-overlay--active .v-card').last()
  await dialog.waitFor({ timeout: FIRST_LOAD_MS })
  await page.waitForTimeout(400)
  await checkPage(page, `${label}-dialog`, found)
  const cancel = dialog.getByRole('button', { name: /^(Cancel|Keep)$/ })
  if (await cancel.count()) await cancel.first().click()
  else await page.keyboard.press('Escape')
  await dialog.waitFor({ state: 'hidden' })
}

const visited = new Set<string | null>()

describe('forms, mail links and dialogs meet WCAG 2.1 AA as axe-core checks them', () => {
  it.each(SIZE_THEMES)(
    'at %s size in the %s theme',
    async (size, theme) => {
      const found: string[] = []
      const label = `${size}-${theme}`
      const context = await newContext(browser, size, theme)
      const page = await context.newPage()
      for (const link of [links.invite, links.reset, links.ack]) visited.add(await audit(page, label, link, found))

      await signIn(page, s.baseUrl, org.users.owner.email)
      for (const path of ['/tanks/new', `/tanks/${tankId}/edit`, `/tanks/${tankId}/build`, '/import', '/backup', '/dev/mail', '/no-such-screen']) {
        visited.add(await audit(page, label, `${s.baseUrl}${path}`, found))
      }

      await open(page, `${s.baseUrl}/tanks/${tankId}`)
      // A chart's points as a table, as someone who cannot see the chart asks for them.
      const chart = page.locator('[data-test=metric-panel-temperature]')
      await chart.locator('[data-test=chart-table-toggle]').click()
      await chart.locator('[data-test=chart-table] caption').waitFor()
      await chart.locator('[data-test=chart-table]').scrollIntoViewIfNeeded()
      await checkPage(page, `${label}-chart-table`, found)
      await auditDialog(page, `${label}-rule`, () => page.locator('[data-test=add-rule]').click(), found)
      await auditDialog(page, `${label}-care-done`, () => page.locator('[data-test=care-task-done-notes]').first().click(), found)
      const planner = page.locator('[data-test=water-change-panel]')
      await planner.locator('input[name=amount]').fill('40')
      await planner.locator('[data-test=water-change-plan-button]').click()
      await planner.locator('[data-test=water-change-plan]').waitFor({ timeout: FIRST_LOAD_MS })
      await planner.scrollIntoViewIfNeeded()
      await checkPage(page, `${label}-water-change-plan`, found)
      // The sample tank's heater top sits above the water left by a 40 % change: the start asks first.
      await auditDialog(page, `${label}-heater-confirm`, () => planner.locator('[data-test=water-change-start]').click(), found)

      // A report's chart as a table: the same shared chart component, fed by the report.
      await open(page, `${s.baseUrl}/reports?tank=${tankId}&period=week&date=${new Date().toISOString().slice(0, 10)}`)
      const reportChart = page.locator('[data-test=report-metric-temperature]')
      await reportChart.locator('[data-test=chart-table-toggle]').click()
      await reportChart.locator('[data-test=chart-table] caption').waitFor()
      await reportChart.locator('[data-test=chart-table]').scrollIntoViewIfNeeded()
      await checkPage(page, `${label}-report-chart-table`, found)

      await open(page, `${s.baseUrl}/tanks/${tankId}/test-kit`)
      await auditDialog(
        page,
        `${label}-test-kit-entry`,
        () =>
          page
            .getByRole('button', { name: /^Edit the entry of/ })
            .first()
            .click(),
        found,
      )
      await auditDialog(
        page,
        `${label}-delete-confirm`,
        () =>
          page
            .getByRole('button', { name: /^Delete the entry of/ })
            .first()
            .click(),
        found,
      )
      await context.close()

      expect(found, found.join('\n\n')).toEqual([])
    },
    420_000,
  )

  it('opened every route this file is listed as auditing', () => {
    expect([...visited].sort()).toEqual([...AUDITED_ROUTES['accessibility-forms.test.ts']!].sort())
  })
})
