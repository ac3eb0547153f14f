import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Role } from '@shared/schemas/auth'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number

const TANK = 'Community tank'
const SITE = 'Viewer Org shop'

// What each role may do (server/access/permissions.ts): owners everything, keepers the daily work, viewers nothing.
const SCREENS = {
  tanks: ['New tank'],
  tank: ['Log test', 'Edit tank', 'Archive', 'Register device', 'Rotate token', 'Revoke'],
  sites: ['New site', `Edit ${SITE}`, `Archive ${SITE}`, 'Create display link'],
} as const
type Screen = keyof typeof SCREENS
const KEEPER_MAY = ['New tank', 'Log test', 'Edit tank']

function expectedControls(role: Role, screen: Screen): string[] {
  if (role === 'owner') return [...SCREENS[screen]]
  if (role === 'keeper') return SCREENS[screen].filter((name) => KEEPER_MAY.includes(name))
  return []
}

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Viewer Org')
  tankId = (await createTankWithDevice(s.ctx, org, TANK)).tankId
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

/** Which of the screen's edit controls are on the page, as buttons or as links styled as buttons. */
async function controlsOn(page: Page, screen: Screen): Promise<string[]> {
  const present: string[] = []
  for (const name of SCREENS[screen]) {
    const control = page.getByRole('button', { name, exact: true }).or(page.getByRole('link', { name, exact: true }))
    if ((await control.count()) > 0) present.push(name)
  }
  return present
}

describe.each(['owner', 'keeper', 'viewer'] as const)('the edit controls a %s sees', (role) => {
  it('on the tanks table, the tank page and the sites page', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } })
    await signIn(page, s.baseUrl, org.users[role].email)

    await page.goto(`${s.baseUrl}/tanks`)
    await page.getByRole('link', { name: TANK, exact: true }).waitFor({ timeout: FIRST_LOAD_MS })
    expect(await controlsOn(page, 'tanks')).toEqual(expectedControls(role, 'tanks'))

    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.getByRole('heading', { name: TANK, exact: true }).waitFor({ timeout: FIRST_LOAD_MS })
    // The devices table has loaded: its row is there for every role, its buttons only for owners.
    await page.locator('[data-test=devices-panel]').getByText(`${TANK} node`).waitFor()
    expect(await controlsOn(page, 'tank')).toEqual(expectedControls(role, 'tank'))
    if (role === 'viewer') await shot(page, 'tank-page-viewer')

    await page.goto(`${s.baseUrl}/sites`)
    await page.getByText(SITE, { exact: true }).first().waitFor({ timeout: FIRST_LOAD_MS })
    expect(await controlsOn(page, 'sites')).toEqual(expectedControls(role, 'sites'))
    // Every role may look at a site's wall.
    expect(await page.getByRole('button', { name: `Open the wall for ${SITE}` }).count()).toBe(1)
    expect(await page.locator('[data-test=wall-displays]').count()).toBe(role === 'owner' ? 1 : 0)
    if (role === 'viewer') await shot(page, 'sites-viewer')
    await page.close()
  })
})

describe('a viewer typing the address of an edit screen', () => {
  it('lands on the tanks table instead', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.viewer.email)
    for (const path of [`/tanks/${tankId}/test-kit`, `/tanks/${tankId}/edit`, '/tanks/new']) {
      await page.goto(`${s.baseUrl}${path}`)
      await page.waitForURL((url) => url.pathname === '/tanks', { timeout: FIRST_LOAD_MS })
      await page.getByRole('link', { name: TANK, exact: true }).waitFor()
      expect(await page.getByRole('link', { name: 'New tank' }).count()).toBe(0)
    }
    await page.close()
  })
})
