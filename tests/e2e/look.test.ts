import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, postTemperatures, tankWithProbe, type App } from './keeper-setup'

// How the screens look where it matters for reading them: no list that runs off a phone's edge,
// and the header and state chips at WCAG 2.1 AA contrast (4.5:1 for text, success criterion 1.4.3;
// relative luminance and contrast ratio as defined in WCAG 2.1, W3C, 2018) in both themes.

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Reedmarsh Aquatics with a rather long business name')
  const owner = org.users.owner.token
  const siteId = org.siteIds[0]!
  const probe = await tankWithProbe(s, owner, siteId, 'Breeding cylinder with a name long enough to wrap on a phone')
  tankId = probe.tankId
  expect(await postTemperatures(s, probe.token, [[Date.now(), 25.4]])).toBe(1)
  const bare = await api(s, '/tanks', owner, { method: 'POST', body: JSON.stringify(sampleTank(siteId, { name: 'Spare tub' })) })
  expect(bare.status).toBe(201)
  const at = new Date()
  for (const [severity, title] of [
    ['alarm', 'Temperature above 28 °C for 10 min on the breeding cylinder by the window'],
    ['warning', 'pH below 6.0'],
  ] as const) {
    await s.ctx.models.Incident.create({
      organizationId: org.organizationId,
      siteId,
      tankId,
      ruleId: null,
      ruleKind: 'below',
      metric: 'ph',
      severity,
      title,
      state: 'open',
      conditionSince: at,
      openedAt: at,
      firstValue: 5.9,
      peakValue: 5.9,
      latestValue: 5.9,
      latestAt: at,
    })
  }
  const post = (path: string, body: unknown) => api(s, path, owner, { method: 'POST', body: JSON.stringify(body) })
  expect((await post(`/sites/${siteId}/roster/shifts`, { userId: org.users.keeper.id, weekday: 0, start: '07:00', end: '19:00' })).status).toBe(201)
  expect((await post(`/tanks/${tankId}/care-tasks`, { kind: 'other', title: 'Rinse the sponge', recurrence: { kind: 'interval', everyDays: 1 } })).status).toBe(
    201,
  )
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function openPage(page: Page, path: string) {
  await page.goto(`${s.baseUrl}${path}`, { timeout: FIRST_LOAD_MS })
  await page.waitForLoadState('networkidle', { timeout: FIRST_LOAD_MS }).catch(() => undefined)
  await page.locator('h1').first().waitFor({ timeout: FIRST_LOAD_MS })
  await page.waitForTimeout(300)
}

/** What runs past the right edge: the page itself, or a table scrolling sideways inside it. */
function sidewaysScroll(page: Page): Promise<string[]> {
  return page.evaluate(`(() => {
    const found = []
    const root = document.scrollingElement
    if (root.scrollWidth > innerWidth) found.push('page ' + root.scrollWidth + ' px wide in ' + innerWidth)
    for (const wrapper of document.querySelectorAll('.v-table__wrapper')) {
      if (wrapper.scrollWidth > wrapper.clientWidth + 1) found.push('table ' + (wrapper.closest('[data-test]')?.getAttribute('data-test') ?? '') + ' ' + wrapper.scrollWidth + ' px wide in ' + wrapper.clientWidth)
    }
    return found
  })()`) as Promise<string[]>
}

describe('at phone width (390×844)', () => {
  const lists = () => ['/', '/tanks', `/tanks/${tankId}`, '/incidents', '/care/today', '/sites', `/sites/${org.siteIds[0]}/roster`, '/users']

  it('no list page scrolls sideways: rows stack as cards', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, reducedMotion: 'reduce' })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.owner.email)
    const found: string[] = []
    for (const path of lists()) {
      await openPage(page, path)
      for (const what of await sidewaysScroll(page)) found.push(`${path}: ${what}`)
      await shot(page, `look-phone${path.replace(/\W+/g, '-')}`)
    }
    // The check can fail: the same table at a width it was never made for.
    await page.setViewportSize({ width: 200, height: 844 })
    await openPage(page, '/users')
    expect(await sidewaysScroll(page)).not.toEqual([])
    await context.close()
    expect(found, found.join('\n')).toEqual([])
  }, 180_000)
})

/** WCAG 2.1 relative luminance of an sRGB colour given as `rgb(r, g, b)` or `rgba(…)`. */
function luminance(css: string): number {
  const [r, g, bl] = css
    .match(/[\d.]+/g)!
    .slice(0, 3)
    .map((c) => {
      const v = Number(c) / 255
      return v <= 0.03928 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4
    })
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * bl!
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x)
  return (hi! + 0.05) / (lo! + 0.05)
}

describe('contrast of the header and the state chips', () => {
  it('is computed as WCAG defines it', () => {
    expect(contrast('rgb(0, 0, 0)', 'rgb(255, 255, 255)')).toBeCloseTo(21, 5)
    // #777 on white is the usual example of a grey just under 4.5:1.
    expect(contrast('rgb(119, 119, 119)', 'rgb(255, 255, 255)')).toBeCloseTo(4.48, 2)
  })

  it.each(['light', 'dark'] as const)(
    'reaches 4.5:1 in the %s theme',
    async (theme) => {
      const context = await browser.newContext({ viewport: { width: 1280, height: 800 }, colorScheme: theme, reducedMotion: 'reduce' })
      const page = await context.newPage()
      await signIn(page, s.baseUrl, org.users.owner.email)
      await openPage(page, '/tanks')
      await page.locator('[data-test="tank-state"]').first().waitFor()
      const pairs = (await page.evaluate(`(() => {
        const pair = (el, label) => {
          let bg = 'rgba(0, 0, 0, 0)'
          for (let at = el; at && /rgba\\(.*, 0\\)$|transparent/.test(bg); at = at.parentElement) bg = getComputedStyle(at).backgroundColor
          return { label, fg: getComputedStyle(el).color, bg }
        }
        const bar = document.querySelector('.v-app-bar')
        return [
          pair(bar.querySelector('.tw-brand'), 'header title'),
          ...[...document.querySelectorAll('[data-test="tank-state"]')].map((chip) => pair(chip.querySelector('.tw-state__word'), 'chip ' + chip.dataset.state)),
        ]
      })()`)) as Array<{ label: string; fg: string; bg: string }>
      await shot(page, `look-contrast-${theme}`)
      await context.close()
      const states = pairs.filter((p) => p.label.startsWith('chip')).map((p) => p.label)
      expect(new Set(states)).toEqual(new Set(['chip alarm', 'chip no_sensor']))
      const weak = pairs.map((p) => ({ ...p, ratio: contrast(p.fg, p.bg) })).filter((p) => p.ratio < 4.5)
      expect(weak, JSON.stringify(weak)).toEqual([])
    },
    120_000,
  )
})

describe('a viewer sent away from a page for owners', () => {
  it('is told why on the page they land on, once', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.viewer.email)
    await page.waitForURL(/\/tanks/, { timeout: FIRST_LOAD_MS })
    // Landing after sign-in is not a refusal.
    expect(await page.locator('[data-test="denied-notice"]').count()).toBe(0)
    await page.goto(`${s.baseUrl}/users`)
    await page.waitForURL(/\/tanks$/, { timeout: FIRST_LOAD_MS })
    await expect
      .poll(() => page.locator('[data-test="denied-notice"]').innerText())
      .toBe('People is open to owners only. As a viewer you cannot open it, so here is the tanks list. Ask an owner if you need it.')
    await page.locator('a[href="/incidents"]').first().click()
    await page.waitForURL(/\/incidents/)
    expect(await page.locator('[data-test="denied-notice"]').count()).toBe(0)
    await context.close()
  }, 90_000)
})

describe("the organisation's clock", () => {
  it('writes every time the chosen way once an owner picks the 12-hour clock', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.owner.email)
    const roster = `/sites/${org.siteIds[0]}/roster`
    await openPage(page, roster)
    const shift = page.locator('[data-test="roster-pattern"] tbody tr').first()
    expect(await shift.innerText()).toMatch(/07:00\s+19:00/)
    await openPage(page, '/account')
    await page.locator('[data-test="clock-12h"]').click()
    await expect.poll(async () => (await api(s, '/auth/me', org.users.keeper.token)).body.organization.clockStyle).toBe('12h')
    await openPage(page, roster)
    expect(await shift.innerText()).toMatch(/7:00 am\s+7:00 pm/)
    await shot(page, 'look-roster-12h')
    await context.close()
  }, 90_000)
})
