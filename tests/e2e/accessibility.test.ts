import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { wallService } from '../../server/sites/wall'
import type { TestOrg } from '../helpers/fixtures'
import { describeViolations, wcagViolations } from './axe'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, postTemperatures, tankWithProbe, type App } from './keeper-setup'

// Every screen, as a keeper's owner sees it with real data on it, is audited with axe-core against
// WCAG 2.1 levels A and AA (Web Content Accessibility Guidelines 2.1, W3C, 2018) in both themes, at
// desktop and phone sizes.

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
  expect(await postTemperatures(s, probe.token, [[now - 20 * 60_000, 25.4], [now - 10 * 60_000, 25.6], [now, 25.5]])).toBe(3)
  expect((await post(`/tanks/${tankId}/care-tasks`, { kind: 'other', title: 'Rinse the filter sponge', recurrence: { kind: 'interval', everyDays: 1 } })).status).toBe(201)
  expect((await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '00:00', end: '00:00' })).status).toBe(201)
  const at = new Date()
  const incident = await s.ctx.models.Incident.create({
    organizationId: org.organizationId, siteId, tankId, ruleId: null, ruleKind: 'below', metric: 'ph', severity: 'warning',
    title: 'pH below 6.0', state: 'open', conditionSince: at, openedAt: at, firstValue: 5.9, peakValue: 5.9, latestValue: 5.9, latestAt: at,
  })
  incidentId = incident.id
  const ownerActor = { kind: 'user' as const, userId: org.users.owner.id, organizationId: org.organizationId, role: 'owner' as const, siteIds: null, sessionId: 'a11y' }
  wallLink = (await wallService(s.ctx).createCredential(ownerActor, siteId, 'Shop wall')).link
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const SIZES = { desktop: { width: 1280, height: 800 }, phone: { width: 390, height: 844 } }
type Size = keyof typeof SIZES
type Theme = 'light' | 'dark'

/** Loads a screen and waits until its data has arrived and its entrance transitions are over. */
async function open(page: Page, path: string) {
  await page.goto(path.startsWith('http') ? path : `${s.baseUrl}${path}`, { timeout: FIRST_LOAD_MS })
  await page.waitForLoadState('networkidle', { timeout: FIRST_LOAD_MS }).catch(() => undefined)
  await page.locator('h1, form, main').first().waitFor({ timeout: FIRST_LOAD_MS })
  // Vuetify fades cards and fields in; an element half-faded would be measured at half its contrast.
  await page.waitForTimeout(400)
}

async function audit(page: Page, label: string, path: string, found: string[]) {
  await open(page, path)
  const violations = await wcagViolations(page)
  if (violations.length) found.push(`${label} ${path}:\n${describeViolations(violations)}`)
  await shot(page, `a11y-${label}${new URL(path, s.baseUrl).pathname.replace(/\W+/g, '-')}`)
}

async function newContext(size: Size, theme: Theme): Promise<BrowserContext> {
  // The app follows the device's colour scheme until someone picks a theme. The page's CSP allows
  // only its own scripts; the audit engine is added from outside it, so this context bypasses it.
  return browser.newContext({ viewport: SIZES[size], colorScheme: theme, reducedMotion: 'reduce', bypassCSP: true })
}

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

  const cases: Array<[Size, Theme]> = [['desktop', 'light'], ['phone', 'light'], ['desktop', 'dark'], ['phone', 'dark']]
  it.each(cases)('at %s size in the %s theme', async (size, theme) => {
    const found: string[] = []
    const context = await newContext(size, theme)
    const page = await context.newPage()
    for (const path of SIGNED_OUT) await audit(page, `${size}-${theme}`, path, found)
    await signIn(page, s.baseUrl, org.users.owner.email)
    await page.evaluate(`localStorage.setItem('tw.careTodayScope', '${org.siteIds[0]}')`)
    for (const path of signedInScreens()) await audit(page, `${size}-${theme}`, path, found)
    await context.close()

    const wallContext = await newContext(size, theme)
    await audit(await wallContext.newPage(), `${size}-${theme}`, new URL(wallLink, s.baseUrl).toString(), found)
    await wallContext.close()

    if (found.length) console.log(found.join('\n\n'))
    expect(found, found.join('\n\n')).toEqual([])
  }, 240_000)
})
