import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { newSecretToken } from '../../server/access/tokens'
import { ackLinksService } from '../../server/incidents/ack-links'
import { createIncidentRow, type TestOrg } from '../helpers/fixtures'
import { go, LookAuditor, settle } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { launchBrowser, startAppForBrowser } from './browser'
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

let visited = new Set<string | null>()

describe('forms, mail links and dialogs meet WCAG 2.1 AA as axe-core checks them', () => {
  // One browser context, signed in once; each screen and dialog is opened once per theme and checked
  // at both sizes (a11y-pages.ts).
  it('at desktop and phone size, in the light and the dark theme', async () => {
    const { context, auditor } = await LookAuditor.start(browser)
    for (const link of [links.invite, links.reset, links.ack]) await auditor.load(link)

    await auditor.signIn(s.baseUrl, org.users.owner.email)
    for (const path of ['/tanks/new', `/tanks/${tankId}/edit`, `/tanks/${tankId}/build`, '/import', '/backup', '/dev/mail', '/no-such-screen']) {
      await auditor.visit(path)
    }

    // A chart's points as a table, as someone who cannot see the chart asks for them.
    const chart = (page: Page) => page.locator('[data-test=metric-panel-temperature]')
    await auditor.each(async (page) => {
      await go(page, `/tanks/${tankId}`)
      await chart(page).locator('[data-test=chart-table-toggle]').click()
      await chart(page).locator('[data-test=chart-table] caption').waitFor()
      await settle(page)
    })
    await auditor.checkEveryLook('chart-table', (page) => chart(page).locator('[data-test=chart-table]'))
    await auditor.overlay('rule-dialog', (page) => page.locator('[data-test=add-rule]').click())
    await auditor.overlay('care-done-dialog', (page) => page.locator('[data-test=care-task-done-notes]').first().click())
    const planner = (page: Page) => page.locator('[data-test=water-change-panel]')
    await auditor.each(async (page) => {
      await planner(page).locator('input[name=amount]').fill('40')
      await planner(page).locator('[data-test=water-change-plan-button]').click()
      await planner(page).locator('[data-test=water-change-plan]').waitFor({ timeout: FIRST_LOAD_MS })
      await settle(page)
    })
    await auditor.checkEveryLook('water-change-plan', planner)
    // The sample tank's heater top sits above the water left by a 40 % change: the start asks first.
    await auditor.overlay('heater-confirm-dialog', (page) => planner(page).locator('[data-test=water-change-start]').click())

    // A report's chart as a table: the same shared chart component, fed by the report.
    const reportChart = (page: Page) => page.locator('[data-test=report-metric-temperature]')
    await auditor.each(async (page) => {
      await go(page, `/reports?tank=${tankId}&period=week&date=${new Date().toISOString().slice(0, 10)}`)
      await reportChart(page).locator('[data-test=chart-table-toggle]').click()
      await reportChart(page).locator('[data-test=chart-table] caption').waitFor()
      await settle(page)
    })
    await auditor.checkEveryLook('report-chart-table', (page) => reportChart(page).locator('[data-test=chart-table]'))

    await auditor.each((page) => go(page, `/tanks/${tankId}/test-kit`))
    await auditor.overlay('test-kit-entry-dialog', (page) =>
      page
        .getByRole('button', { name: /^Edit the entry of/ })
        .first()
        .click(),
    )
    await auditor.overlay('delete-confirm-dialog', (page) =>
      page
        .getByRole('button', { name: /^Delete the entry of/ })
        .first()
        .click(),
    )
    await context.close()

    visited = auditor.visited
    expect(auditor.found, auditor.found.join('\n\n')).toEqual([])
  }, 480_000)

  it('opened every route this file is listed as auditing', () => {
    expect([...visited].sort()).toEqual([...AUDITED_ROUTES['accessibility-forms.test.ts']!].sort())
  })
})
