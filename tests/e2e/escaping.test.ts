import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { wallService } from '../../server/sites/wall'
import { createIncidentRow, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, type App } from './keeper-setup'

// Names are user input: every screen must show them as text, never as markup. The page's CSP
// already blocks inline handlers, so `window.__x` alone would not prove escaping: the test also
// asserts that no element was made from the name (no <img src="x"> in the DOM) and that the name
// is on the page literally.
const MARKUP = '<img src=x onerror=window.__x=1>'
const named = (what: string) => `${what} ${MARKUP}`

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
  org = await s.createOrg('Marrowfen Escaping')
  const owner = org.users.owner.token
  const siteId = org.siteIds[0]
  const patch = (path: string, body: unknown) => api(s, path, owner, { method: 'PATCH', body: JSON.stringify(body) })
  const post = (path: string, body: unknown) => api(s, path, owner, { method: 'POST', body: JSON.stringify(body) })
  expect((await patch(`/sites/${siteId}`, { name: named('Site') })).status).toBe(200)
  expect((await patch(`/users/${org.users.keeper.id}`, { name: named('Keeper') })).status).toBe(200)
  tankId = (await tankWithProbe(s, owner, siteId, named('Tank'))).tankId
  expect((await post(`/tanks/${tankId}/rules`, { name: named('Rule'), severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6 } })).status).toBe(201)
  expect((await post(`/tanks/${tankId}/care-tasks`, { kind: 'other', title: named('Task'), recurrence: { kind: 'interval', everyDays: 1 } })).status).toBe(201)
  expect((await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '00:00', end: '00:00' })).status).toBe(201)
  const incident = await createIncidentRow(s.ctx, org, tankId, {
    ruleKind: 'below',
    metric: 'ph',
    severity: 'warning',
    title: named('Incident'),
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
    sessionId: 'escaping',
  }
  wallLink = (await wallService(s.ctx).createCredential(ownerActor, siteId, named('Wall'))).link
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** Loads a screen, waits for a name on it, and reports what an injection would have left behind. */
async function visit(page: Page, path: string, expectName: string) {
  await page.goto(path.startsWith('http') ? path : `${s.baseUrl}${path}`)
  await page.getByText(expectName, { exact: false }).first().waitFor({ timeout: FIRST_LOAD_MS })
  return {
    path,
    injectedImages: await page.locator('img[src="x"]').count(),
    ranHandler: await page.evaluate('window.__x'),
    literal: (await page.content()).includes('&lt;img src=x onerror=window.__x=1&gt;'),
  }
}

describe('markup in names is shown as text on every screen', () => {
  it('tanks, tank, test kit, sites, roster, incidents, incident, care today, users and the wall', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.owner.email)
    // Care today remembers its scope in the browser; choose the site with the task.
    await page.evaluate(`localStorage.setItem('tw.careTodayScope', '${org.siteIds[0]}')`)
    const screens: Array<[string, string]> = [
      ['/tanks', named('Tank')],
      [`/tanks/${tankId}`, named('Tank')],
      [`/tanks/${tankId}/test-kit`, named('Tank')],
      ['/sites', named('Site')],
      [`/sites/${org.siteIds[0]}/roster`, named('Keeper')],
      ['/incidents', named('Incident')],
      [`/incidents/${incidentId}`, named('Incident')],
      ['/care/today', named('Task')],
      ['/users', named('Keeper')],
    ]
    const seen = []
    for (const [path, name] of screens) seen.push(await visit(page, path, name))
    await shot(page, 'escaping-users')
    const wall = await browser.newPage({ viewport: { width: 1920, height: 1080 } })
    seen.push(await visit(wall, new URL(wallLink, s.baseUrl).toString(), named('Tank')))
    console.log(`escaping: ${seen.length} screens visited, ${seen.filter((v) => v.injectedImages || v.ranHandler !== undefined).length} with injected markup`)
    expect(seen.filter((v) => v.injectedImages > 0 || v.ranHandler !== undefined)).toEqual([])
    expect(seen.filter((v) => !v.literal).map((v) => v.path)).toEqual([])
    await page.close()
    await wall.close()
  })
})
