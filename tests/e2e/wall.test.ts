import mqtt from 'mqtt'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readingsTopic } from '@shared/ingest/contract'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import {
  api,
  backgroundOf,
  FIRST_LOAD_MS,
  liveSubscribed,
  MINUTE_MS,
  postTemperatures,
  tankWithProbe,
  waitForRuleLeader,
  writeStorage,
  type App,
} from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let siteId: number

// Five tanks well inside their 24–28 °C band, each with its own value so a tile cannot show another's.
const STEADY = [
  { name: 'Amazon basin', celsius: 25.1 },
  { name: 'Betta row', celsius: 25.3 },
  { name: 'Cichlid rocks', celsius: 25.5 },
  { name: 'Discus show', celsius: 25.7 },
  { name: 'Endler trio', celsius: 25.9 },
]
// Named and ordered to come last, so only its alarm can bring it to the front.
const HOT = { name: 'Zebra danio school', sortOrder: 9 }
const HOT_TITLE = 'Temperature above 28 °C for 10 min'
const probes = new Map<string, Awaited<ReturnType<typeof tankWithProbe>>>()

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Wall Org')
  siteId = org.siteIds[0]
  await waitForRuleLeader(s)
  const owner = org.users.owner.token
  for (const [i, tank] of STEADY.entries()) {
    const probe = await tankWithProbe(s, owner, siteId, tank.name, i)
    probes.set(tank.name, probe)
    expect(await postTemperatures(s, probe.token, [[Date.now() - 30_000, tank.celsius]])).toBe(1)
  }
  // A heater stuck on: 28.4 °C rising to 29.6 °C over 12 minutes trips the starter alarm rule.
  const hot = await tankWithProbe(s, owner, siteId, HOT.name, HOT.sortOrder)
  probes.set(HOT.name, hot)
  const t0 = Date.now() - 20 * MINUTE_MS
  const rising = Array.from({ length: 13 }, (_, i): [number, number] => [t0 + i * MINUTE_MS, Math.round((28.4 + i * 0.1) * 10) / 10])
  expect(await postTemperatures(s, hot.token, rising)).toBe(13)
  await s.rules.engine.settle()
  const open = await api(s, `/incidents?tankId=${hot.tankId}`, owner)
  expect(open.body.items.map((i: { severity: string; state: string; title: string }) => [i.severity, i.state, i.title])).toEqual([['alarm', 'open', HOT_TITLE]])
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const tile = (page: Page, name: string) => page.getByRole('article', { name: new RegExp(`^${name}:`) })
const tileTemperature = (page: Page, name: string) => tile(page, name).locator('[data-test=tile-temperature]').textContent()

async function openWall(page: Page, theme?: 'tankwardenLight' | 'tankwardenDark') {
  await signIn(page, s.baseUrl, org.users.keeper.email)
  if (theme) await writeStorage(page, 'tw.theme', theme)
  await page.goto(`${s.baseUrl}/wall/${siteId}`)
  await page.locator('[data-test=wall-grid] article').nth(5).waitFor({ timeout: FIRST_LOAD_MS })
}

describe('the wall of a site, for a keeper at a 1920×1080 screen', () => {
  it('shows every tank with its temperature, the alarm tank first, and one open incident', async () => {
    const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } })
    await openWall(page, 'tankwardenLight')
    const tiles = page.locator('[data-test=wall-grid] article')
    expect(await tiles.count()).toBe(6)
    expect(await page.locator('[data-test=wall-page]').count()).toBe(0)

    const first = tiles.first()
    expect(await first.getAttribute('aria-label')).toBe(`${HOT.name}: Alarm`)
    expect(await first.getAttribute('data-state')).toBe('alarm')
    expect((await first.locator('[data-test=tile-state]').textContent())?.trim()).toBe('Alarm')
    expect((await first.locator('[data-test=tile-incident]').textContent())?.trim()).toBe(HOT_TITLE)
    expect((await first.locator('[data-test=tile-temperature]').textContent())?.replace(/\s/g, '')).toBe('29.6°C')

    // The rest follow in the site's own order, each steady with its own value.
    const labels = await tiles.evaluateAll((els) => els.map((e) => e.getAttribute('aria-label')))
    expect(labels.slice(1)).toEqual(STEADY.map((t) => `${t.name}: Steady`))
    for (const tank of STEADY) expect((await tileTemperature(page, tank.name))?.replace(/\s/g, '')).toBe(`${tank.celsius.toFixed(1)}°C`)

    expect((await page.locator('[data-test=wall-incidents]').textContent())?.replace(/\s+/g, ' ').trim()).toBe('Open incidents: 1')
    expect(await backgroundOf(page.locator('.tw-wall'))).toBe('rgb(243, 246, 246)')
    await shot(page, 'wall-light-1920')
    await page.close()
  })

  it('updates a tile within seconds of a reading published over MQTT with QoS 1', async () => {
    const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } })
    const subscribed = liveSubscribed(page)
    await openWall(page)
    await subscribed
    expect((await tileTemperature(page, 'Betta row'))?.replace(/\s/g, '')).toBe('25.3°C')

    const probe = probes.get('Betta row')!
    const client = await mqtt.connectAsync(s.mqttUrl, {
      username: String(probe.deviceId),
      password: probe.token,
      reconnectPeriod: 0,
      connectTimeout: 5000,
      clientId: `wall-e2e-${process.pid}`,
    })
    try {
      const started = Date.now()
      const payload = { v: 1, readings: [{ metric: 'temperature', value: 26.8, unit: 'C', time: new Date().toISOString() }] }
      await client.publishAsync(readingsTopic(probe.deviceId), JSON.stringify(payload), { qos: 1 })
      await expect.poll(async () => (await tileTemperature(page, 'Betta row'))?.replace(/\s/g, ''), { timeout: 5000, interval: 100 }).toBe('26.8°C')
      expect(Date.now() - started).toBeLessThan(5000)
    } finally {
      await client.endAsync()
    }
    // Only the tank that reported changed.
    expect((await tileTemperature(page, 'Amazon basin'))?.replace(/\s/g, '')).toBe('25.1°C')
    expect((await page.locator('[data-test=wall-status]').textContent())?.trim()).toBe('Live')
    await page.close()
  })

  it('draws the same wall in the dark theme', async () => {
    const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } })
    await openWall(page, 'tankwardenDark')
    expect(await backgroundOf(page.locator('.tw-wall'))).toBe('rgb(14, 21, 23)')
    expect(await page.locator('[data-test=wall-grid] article').first().getAttribute('aria-label')).toBe(`${HOT.name}: Alarm`)
    await shot(page, 'wall-dark-1920')
    await page.close()
  })
})
