import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { wallService } from '../../server/sites/wall'
import { createIncidentRow, type TestOrg } from '../helpers/fixtures'
import { LookAuditor } from './a11y-pages'
import { AUDITED_ROUTES } from './audited-routes'
import { unnamedIconButtons, wcagViolations } from './axe'
import { launchBrowser, startAppForBrowser } from './browser'
import { api, postTemperatures, tankWithProbe, type App } from './keeper-setup'

// Every screen, as a keeper's owner sees it with real data on it, is audited with axe-core against
// WCAG 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both themes, at
// desktop and phone sizes. The screens of forms, mail links and dialogs are in
// accessibility-forms.test.ts.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
let incidentId: number
let wallLink: string

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Fernbrook Aquatics')
  const owner = org.users.owner.token
  const siteId = org.siteIds[0]
  const post = (path: string, body: unknown) => api(s, path, owner, { method: 'POST', body: JSON.stringify(body) })
  const probe = await tankWithProbe(s, owner, siteId, 'Reef display')
  tankId = probe.tankId
  const now = Date.now()
  expect(
    await postTemperatures(s, probe.token, [
      [now - 20 * 60_000, 25.4],
      [now - 10 * 60_000, 25.6],
      [now, 25.5],
    ]),
  ).toBe(3)
  expect(
    (await post(`/tanks/${tankId}/care-tasks`, { kind: 'other', title: 'Rinse the filter sponge', recurrence: { kind: 'interval', everyDays: 1 } })).status,
  ).toBe(201)
  expect((await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '00:00', end: '00:00' })).status).toBe(201)
  const incident = await createIncidentRow(s.ctx, org, tankId, {
    ruleKind: 'below',
    metric: 'ph',
    severity: 'warning',
    title: 'pH below 6.0',
    firstValue: 5.9,
    peakValue: 5.9,
    latestValue: 5.9,
  })
  incidentId = incident.id
  const ownerActor = {
    kind: 'user' as const,
    userId: org.users.owner.id,
    organizationId: org.organizationId,
    role: 'owner' as const,
    siteIds: null,
    sessionId: 'a11y',
  }
  wallLink = (await wallService(s.ctx).createCredential(ownerActor, siteId, 'Shop wall')).link
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const SIGNED_OUT = ['/sign-in', '/forgot-password']
const signedInScreens = () => [
  '/',
  '/tanks',
  `/tanks/${tankId}`,
  `/tanks/${tankId}/test-kit`,
  '/incidents',
  `/incidents/${incidentId}`,
  '/care/today',
  `/sites/${org.siteIds[0]}/roster`,
  '/reports',
  '/sites',
  '/users',
  '/account',
]

describe('every screen meets WCAG 2.1 AA as axe-core checks it', () => {
  it('the audit itself finds what it should: a picture without a text alternative, pale text', async () => {
    const page = await browser.newPage()
    await page.setContent('<html lang="en"><title>t</title><body><main><img src="tank.png"><p style="color:#aaa">pale</p></main></body></html>')
    const violations = await wcagViolations(page)
    expect(violations.map((v) => v.id).sort()).toEqual(['color-contrast', 'image-alt'])
    await page.close()
  })

  it('and names every icon-only button by what it does', async () => {
    const page = await browser.newPage()
    await page.setContent(
      '<main><button><i class="mdi mdi-pencil"></i></button><button aria-label="Edit the tank"><i class="mdi mdi-pencil"></i></button>' +
        '<button aria-label="Reef appended action"><i></i></button><button>Save</button>' +
        '<i role="button" aria-hidden="true" tabindex="-1" class="mdi mdi-menu-down"></i></main>',
    )
    expect(await unnamedIconButtons(page)).toEqual(['button', 'button named "Reef appended action"'])
    await page.close()
  })

  let visited = new Set<string | null>()
  // One browser context, signed in once; each screen is opened once per theme and checked at both
  // sizes (a11y-pages.ts).
  it('on every screen, at desktop and phone size, in the light and the dark theme', async () => {
    const { context, auditor } = await LookAuditor.start(browser)
    for (const path of SIGNED_OUT) await auditor.load(`${s.baseUrl}${path}`)
    await auditor.signIn(s.baseUrl, org.users.owner.email)
    await auditor.pages.light.evaluate(`localStorage.setItem('tw.careTodayScope', '${org.siteIds[0]}')`)
    for (const path of signedInScreens()) await auditor.visit(path)
    await context.close()

    // The wall signs in as its display, so it has a context of its own.
    const { context: wallContext, auditor: wall } = await LookAuditor.start(browser)
    await wall.load(new URL(wallLink, s.baseUrl).toString())
    await wallContext.close()

    visited = new Set([...auditor.visited, ...wall.visited])
    const found = [...auditor.found, ...wall.found]
    expect(found, found.join('\n\n')).toEqual([])
  }, 480_000)

  it('opened every route this file is listed as auditing', () => {
    expect([...visited].sort()).toEqual([...AUDITED_ROUTES['accessibility.test.ts']!].sort())
  })
})
