import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TankListItem } from '@shared/schemas/tanks'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, liveSubscribed, MINUTE_MS, waitForRuleLeader, type App } from './keeper-setup'

// States as the wall computes them (shared/tank-state.ts) from real readings and incidents. The
// starter band of a tropical freshwater tank is 24–28 °C; within a tenth of its width of an edge
// (above 27.6 °C) a tank is one to watch; 10 min above 28 °C opens the starter alarm.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let siteName: string
const HOT_TITLE = 'Temperature above 28 °C for 10 min'
const probes: Record<string, { tankId: number; token: string }> = {}

/** A tank made through the API, with a device reporting temperature and pH every `intervalSeconds`. */
async function tankWithNode(name: string, intervalSeconds: number) {
  const owner = org.users.owner.token
  const tank = await api(s, '/tanks', owner, { method: 'POST', body: JSON.stringify(sampleTank(org.siteIds[0], { name })) })
  expect(tank.status, JSON.stringify(tank.body)).toBe(201)
  const device = await api(s, '/devices', owner, {
    method: 'POST',
    body: JSON.stringify({ tankId: tank.body.id, name: `${name} node`, metrics: ['temperature', 'ph'], intervalSeconds }),
  })
  expect(device.status, JSON.stringify(device.body)).toBe(201)
  probes[name] = { tankId: tank.body.id, token: device.body.token }
}

/** Readings over HTTP as the device would send them: `[time ms, metric, value]`. */
async function post(name: string, readings: Array<[number, string, number]>) {
  const body = { v: 1, readings: readings.map(([at, metric, value]) => ({ metric, value, time: new Date(at).toISOString() })) }
  const answer = await api(s, '/readings', probes[name]!.token, { method: 'POST', body: JSON.stringify(body) })
  expect(answer.body?.accepted, JSON.stringify(answer.body)).toBe(readings.length)
}

/** 28.4 °C rising by 0.1 °C a minute for 12 minutes: a heater stuck on, ending at `end`. */
const heaterStuckOn = (end: number): Array<[number, string, number]> =>
  Array.from({ length: 13 }, (_, i) => [end - (12 - i) * MINUTE_MS, 'temperature', Math.round((28.4 + i * 0.1) * 10) / 10])

async function listedStates() {
  const res = await api(s, '/tanks?pageSize=50', org.users.keeper.token)
  return Object.fromEntries((res.body.items as TankListItem[]).map((t) => [t.name, t.status.state]))
}

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Tank List Org')
  siteName = 'Tank List Org shop'
  await waitForRuleLeader(s)
  const now = Date.now()
  // Reports every 5 s, once: silent for three intervals, it is quiet.
  await tankWithNode('Quiet tank', 5)
  await post('Quiet tank', [[now, 'temperature', 25.2]])
  await tankWithNode('Steady tank', 600)
  await post('Steady tank', [
    [now - 3 * MINUTE_MS, 'temperature', 25.5],
    [now - 3 * MINUTE_MS, 'ph', 7.0],
  ])
  await tankWithNode('Watch tank', 600)
  // Ten minutes old: within the starter rule's 15 minutes of allowed silence.
  await post('Watch tank', [
    [now - 10 * MINUTE_MS, 'temperature', 27.8],
    [now - 10 * MINUTE_MS, 'ph', 7.1],
  ])
  await tankWithNode('Alarm tank', 600)
  await post('Alarm tank', heaterStuckOn(now - 8 * MINUTE_MS))
  await s.rules.engine.settle()
  const wanted = JSON.stringify({ 'Alarm tank': 'alarm', 'Quiet tank': 'quiet', 'Steady tank': 'steady', 'Watch tank': 'watch' })
  let states = ''
  for (let i = 0; i < 40 && states !== wanted; i++) {
    if (i) await new Promise((r) => setTimeout(r, 1000))
    states = JSON.stringify(await listedStates())
  }
  expect(states).toBe(wanted)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const row = (page: Page, name: string) => page.locator('tbody tr', { has: page.locator(`[data-tank="${name}"]`) })
// textContent: the state word is drawn in capitals by CSS, and innerText would report them.
const text = async (page: Page, name: string, test: string) =>
  ((await row(page, name).locator(`[data-test=${test}]`).first().textContent()) ?? '').replace(/\s+/g, ' ').trim()
const iconOf = (page: Page, name: string) => row(page, name).locator('[data-test=tank-state-icon]').getAttribute('class')

/** How wide the page's content is: wider than the window means scrolling sideways. */
const pageWidth = (page: Page) =>
  page.evaluate(() => (globalThis as unknown as { document: { documentElement: { scrollWidth: number } } }).document.documentElement.scrollWidth)

async function openList(page: Page) {
  await signIn(page, s.baseUrl, org.users.keeper.email)
  await page.goto(`${s.baseUrl}/tanks`)
  await row(page, 'Watch tank').waitFor({ timeout: FIRST_LOAD_MS })
}

const EXPECTED = [
  { name: 'Steady tank', word: 'Steady', icon: 'mdi-check-circle' },
  { name: 'Watch tank', word: 'Watch', icon: 'mdi-eye' },
  { name: 'Alarm tank', word: 'Alarm', icon: 'mdi-alert-octagon' },
  { name: 'Quiet tank', word: 'Quiet', icon: 'mdi-access-point-network-off' },
]

describe('the tanks list, for a keeper', () => {
  it('shows each tank with its state, its latest temperature and pH with their age, and its open incidents (1280×800)', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await openList(page)
    expect(await page.title()).toBe('Tanks · Tankwarden')
    for (const tank of EXPECTED) {
      expect(await text(page, tank.name, 'tank-state'), tank.name).toBe(tank.word)
      expect(await iconOf(page, tank.name), tank.name).toContain(tank.icon)
    }
    // The same word and icon as the wall's tile for the same tank.
    expect(await row(page, 'Steady tank').locator('[data-test=tank-state]').getAttribute('data-state')).toBe('steady')

    expect(await text(page, 'Steady tank', 'latest-temperature')).toMatch(/^25\.5 °C · [34] min ago$/)
    expect(await text(page, 'Steady tank', 'latest-ph')).toMatch(/^pH 7\.00 · [34] min ago$/)
    expect(await text(page, 'Watch tank', 'latest-temperature')).toMatch(/^27\.8 °C · 1[01] min ago$/)
    expect(await text(page, 'Alarm tank', 'latest-temperature')).toMatch(/^29\.6 °C · [89] min ago$/)
    expect(await text(page, 'Alarm tank', 'latest-ph')).toBe('no pH reading')
    expect(await text(page, 'Alarm tank', 'open-incidents')).toBe(`alarm: ${HOT_TITLE}`)
    expect(await text(page, 'Steady tank', 'no-open-incidents')).toBe('None open')
    expect(await page.locator('thead').innerText()).toContain('Tank volume')
    expect(await page.locator('[data-test=volume-note]').innerText()).toContain('Tank volume is what the tank holds to the rim')
    // Nothing wider than the window.
    expect(await pageWidth(page)).toBeLessThanOrEqual(1280)
    await shot(page, 'tanks-list-1280')
    await page.close()
  })

  it('stacks each tank on a phone (390×844) without sideways scrolling', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await openList(page)
    for (const tank of EXPECTED) expect(await text(page, tank.name, 'tank-state'), tank.name).toBe(tank.word)
    expect(await text(page, 'Steady tank', 'latest-temperature')).toMatch(/^25\.5 °C · [34] min ago$/)
    expect(await pageWidth(page)).toBeLessThanOrEqual(390)
    // The bar carries the open-incident count where the menu is folded away.
    expect(await page.locator('[data-test=bar-open-incidents]').getAttribute('aria-label')).toBe('Incidents: 1 open')
    await shot(page, 'tanks-list-390')
    await page.close()
  })

  it('moves a row live: a reading makes a tank one to watch, an incident opening makes it an alarm, and the menu counts it', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    const subscribed = liveSubscribed(page)
    await openList(page)
    await subscribed
    const navCount = page.locator('[data-test=nav-open-incidents]')
    await expect.poll(async () => (await navCount.innerText()).trim(), { timeout: 10_000 }).toBe('1')

    // 27.9 °C is within 0.4 °C of the 28 °C top of the band.
    await post('Steady tank', [[Date.now(), 'temperature', 27.9]])
    await expect.poll(() => text(page, 'Steady tank', 'latest-temperature'), { timeout: 10_000, interval: 100 }).toBe('27.9 °C · just now')
    expect(await text(page, 'Steady tank', 'tank-state')).toBe('Watch')
    expect(await iconOf(page, 'Steady tank')).toContain('mdi-eye')

    await post('Watch tank', heaterStuckOn(Date.now()))
    await expect.poll(() => text(page, 'Watch tank', 'tank-state'), { timeout: 20_000, interval: 200 }).toBe('Alarm')
    expect(await iconOf(page, 'Watch tank')).toContain('mdi-alert-octagon')
    expect(await text(page, 'Watch tank', 'open-incidents')).toBe(`alarm: ${HOT_TITLE}`)
    expect(await text(page, 'Watch tank', 'latest-temperature')).toBe('29.6 °C · just now')
    await expect.poll(async () => (await navCount.innerText()).trim(), { timeout: 10_000 }).toBe('2')
    await page.close()
  })

  it('has a Wall entry for each site, and each page names what it shows in its title', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await openList(page)
    const walls = page.locator('[data-test=nav-wall]')
    expect(await walls.evaluateAll((links) => links.map((a) => [a.getAttribute('aria-label'), a.getAttribute('href')]))).toEqual([
      ['Wall of Tank List Org fish room', `/wall/${org.siteIds[1]}`],
      ['Wall of Tank List Org shop', `/wall/${org.siteIds[0]}`],
    ])

    await page.goto(`${s.baseUrl}/tanks?siteId=${org.siteIds[0]}`)
    await expect.poll(() => page.title(), { timeout: FIRST_LOAD_MS }).toBe(`Tanks at ${siteName} · Tankwarden`)

    await row(page, 'Alarm tank').locator('[data-test=tank-row]').click()
    await page.waitForURL(`**/tanks/${probes['Alarm tank']!.tankId}`)
    await expect.poll(() => page.title(), { timeout: FIRST_LOAD_MS }).toBe('Alarm tank · Tankwarden')
    // A jump within the page keeps the tank's name.
    await page.getByRole('link', { name: 'Devices' }).click()
    await page.waitForURL('**#devices')
    expect(await page.title()).toBe('Alarm tank · Tankwarden')
    await page.locator('[data-test=log-test]').click()
    await page.waitForURL('**/test-kit')
    await expect.poll(() => page.title(), { timeout: FIRST_LOAD_MS }).toBe('Log test · Alarm tank · Tankwarden')

    await page.goBack()
    await page.goBack()
    await page.goBack()
    await row(page, 'Alarm tank').locator('[data-test=open-incidents] a').click()
    await page.waitForURL('**/incidents/*')
    await expect.poll(() => page.title(), { timeout: FIRST_LOAD_MS }).toBe(`${HOT_TITLE} · Tankwarden`)

    await page.locator('[data-test=nav-wall]', { hasText: siteName }).click()
    await page.waitForURL(`**/wall/${org.siteIds[0]}`)
    await page.locator('[data-test=wall-grid] article').first().waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.title()).toBe(`Wall · ${siteName} · Tankwarden`)
    await page.close()
  })

  it('says on the tank page which volume is the tank and which is the water (390×844)', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${probes['Steady tank']!.tankId}`)
    const panel = page.locator('[data-test=water-change-panel]')
    await panel.locator('input[name=amount]').waitFor({ timeout: FIRST_LOAD_MS })
    // 100 × 40 × 50 cm inside holds 200 L to the rim; with no water-level reading the planner assumes
    // 90 % of the height, 45 cm, so 100 × 40 × 45 cm = 180 L of water over a bare floor.
    const fact = page
      .locator('div', { has: page.getByText('Tank volume', { exact: true }) })
      .filter({ hasText: 'to the rim' })
      .last()
    expect((await fact.innerText()).replace(/\s+/g, ' ').trim()).toBe('Tank volume 200 L to the rim, from inside dimensions')
    await panel.locator('input[name=amount]').fill('12')
    await panel.locator('[data-test=water-change-plan-button]').click()
    await panel.locator('[data-test=water-change-plan]').waitFor()
    expect(await panel.locator('[data-test=plan-litres]').innerText()).toBe('21.6 L (12 % of 180 L)')
    expect((await panel.locator('[data-test=plan-water-volume]').innerText()).replace(/\s+/g, ' ')).toBe(
      '180 L is the water in the tank: filled to 45 cm, above the substrate (rock and decoration not taken off). The tank volume, to the rim, is 200 L.',
    )
    await panel.locator('[data-test=water-change-plan]').scrollIntoViewIfNeeded()
    await shot(page, 'water-change-volumes-390')
    expect(await pageWidth(page)).toBeLessThanOrEqual(390)
    await page.close()
  })
})
