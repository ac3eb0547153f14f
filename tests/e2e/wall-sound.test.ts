import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, MINUTE_MS, postTemperatures, tankWithProbe, waitForRuleLeader, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let siteId: number

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Sound Org')
  siteId = org.siteIds[0]
  await waitForRuleLeader(s)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

describe('the wall can be heard', () => {
  it('a display enables the sound with one tap, chimes when a tile enters alarm, and stops once it is acknowledged', async () => {
    const owner = org.users.owner.token
    const calm = await tankWithProbe(s, owner, siteId, 'Quiet corner', 0)
    expect(await postTemperatures(s, calm.token, [[Date.now() - 30_000, 25.2]])).toBe(1)
    const hot = await tankWithProbe(s, owner, siteId, 'Shrimp tank', 1)
    expect(await postTemperatures(s, hot.token, [[Date.now() - 16 * MINUTE_MS, 25.4]])).toBe(1)

    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/wall/${siteId}`)
    await page.locator('[data-test=wall-grid] article').nth(1).waitFor({ timeout: FIRST_LOAD_MS })
    await page.locator('[data-test=wall-sound-enable]').click()
    await page.locator('[data-test=wall-sound-on]').waitFor()
    // Count what the audio element itself reports from here on.
    // (The server's type check has no DOM library: the element is typed by what is used of it.)
    type CountedAudio = { plays?: number; addEventListener(type: 'play', listener: () => void): void }
    await page.locator('[data-test=wall-chime]').evaluate((el) => {
      const audio = el as unknown as CountedAudio
      audio.plays = 0
      audio.addEventListener('play', () => (audio.plays = (audio.plays ?? 0) + 1))
    })
    const plays = () => page.locator('[data-test=wall-chime]').evaluate((el) => (el as unknown as CountedAudio).plays ?? 0)
    expect(await plays()).toBe(0)

    // A heater stuck on: above 28 °C for 12 minutes trips the starter alarm rule.
    const t0 = Date.now() - 14 * MINUTE_MS
    expect(
      await postTemperatures(
        s,
        hot.token,
        Array.from({ length: 13 }, (_, i): [number, number] => [t0 + i * MINUTE_MS, 28.6 + i * 0.1]),
      ),
    ).toBe(13)
    await s.rules.engine.settle()
    await expect.poll(plays, { timeout: 15_000, interval: 200 }).toBe(1)
    expect(await page.locator('article[data-state=alarm]').count()).toBe(1)
    await shot(page, 'wall-sound-1280')

    // Acknowledged from the app: the wall redraws and the chime has nothing left to repeat for.
    // The alarm itself: the tank may have other watches of its own (a probe standing still) by now.
    const incident = ((await api(s, `/incidents?tankId=${hot.tankId}`, owner)).body.items as Array<{ id: number; severity: string; state: string }>).find(
      (i) => i.severity === 'alarm' && i.state === 'open',
    )!
    expect((await api(s, `/incidents/${incident.id}/acknowledge`, owner, { method: 'POST', body: JSON.stringify({ note: 'Unplugged it' }) })).status).toBe(200)
    await page.locator('[data-test=tile-acknowledged]').waitFor({ timeout: 15_000 })
    expect(await plays()).toBe(1)

    // Muting for a chosen time is one menu away.
    await page.locator('[data-test=wall-sound-on]').click()
    await page.locator('[data-test=wall-mute-60]').click()
    expect(await page.locator('[data-test=wall-sound-muted]').textContent()).toMatch(/Muted until \d\d:\d\d/)
    await page.setViewportSize({ width: 390, height: 844 })
    await shot(page, 'wall-sound-390')
    await page.close()
  })
})

describe('planned quiet on the roster and the wall', () => {
  it('a maintenance window shows in the roster week and on the tiles it covers', async () => {
    const owner = org.users.owner.token
    const now = Date.now()
    const created = await api(s, `/sites/${siteId}/maintenance-windows`, owner, {
      method: 'POST',
      body: JSON.stringify({
        reason: 'Filter service',
        repeat: 'once',
        startsAt: new Date(now - 10 * MINUTE_MS).toISOString(),
        endsAt: new Date(now + 50 * MINUTE_MS).toISOString(),
      }),
    })
    expect(created.status).toBe(201)
    const weekly = await api(s, `/sites/${siteId}/maintenance-windows`, owner, {
      method: 'POST',
      body: JSON.stringify({ reason: 'Weekly glass polish', repeat: 'weekly', weekday: 1, start: '09:00', durationMinutes: 90 }),
    })
    expect(weekly.status).toBe(201)
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/sites/${siteId}/roster`)
    await page.locator('[data-test=maintenance-line]').first().waitFor({ timeout: FIRST_LOAD_MS })
    const lines = await page.locator('[data-test=maintenance-line]').allTextContents()
    expect(lines.some((l) => l.includes('Filter service'))).toBe(true)
    expect(lines.some((l) => l.includes('Weekly glass polish') && l.includes('every week'))).toBe(true)
    await page.locator('[data-test=maintenance-panel]').scrollIntoViewIfNeeded()
    await shot(page, 'roster-maintenance-1280')
    await page.goto(`${s.baseUrl}/wall/${siteId}`)
    await page.locator('[data-test=tile-maintenance]').first().waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('[data-test=tile-maintenance]').first().textContent()).toMatch(/Maintenance until \d\d:\d\d: Filter service/)
    await page.setViewportSize({ width: 390, height: 844 })
    await page.goto(`${s.baseUrl}/sites/${siteId}/roster`)
    await page.locator('[data-test=maintenance-line]').first().waitFor({ timeout: FIRST_LOAD_MS })
    await page.locator('[data-test=maintenance-panel]').scrollIntoViewIfNeeded()
    await shot(page, 'roster-maintenance-390')
    await page.close()
  })
})

describe('the rule dialog', () => {
  it('sets the settle window and says in plain words what a missing reading means', async () => {
    const tank = await tankWithProbe(s, org.users.owner.token, siteId, 'Rule dialog tank', 5)
    for (const viewport of [
      { width: 1280, height: 800 },
      { width: 390, height: 844 },
    ]) {
      const page = await browser.newPage({ viewport })
      await signIn(page, s.baseUrl, org.users.owner.email)
      await page.goto(`${s.baseUrl}/tanks/${tank.tankId}`)
      await page.locator('[data-test=add-rule]').click({ timeout: FIRST_LOAD_MS })
      const dialog = page.locator('[data-test=rule-dialog]')
      await dialog.waitFor()
      expect(await dialog.locator('input[name=settleMinutes]').inputValue()).toBe('30')
      await dialog.locator('[data-test=missing-reading]').click()
      const options = await page.locator('.v-overlay--active .v-list-item-title').allTextContents()
      expect(options).toEqual(['Keep the last state', 'Count as tripped: opens the incident', 'Count as clear: closes the incident'])
      expect(await dialog.textContent()).toContain('When no temperature reading has come for 15 min')
      await page.keyboard.press('Escape')
      await page.locator('.v-overlay--active .v-list').waitFor({ state: 'hidden' })
      await shot(page, `rule-dialog-${viewport.width}`)
      await page.close()
    }
  })
})
