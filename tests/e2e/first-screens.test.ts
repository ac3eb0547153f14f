import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, type App } from './keeper-setup'

// The screens a keeper opens first: Care today while on duty nowhere, and a test-kit entry on a phone.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('First Screens Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function newTank(name: string, siteId = org.siteIds[0] as number) {
  const res = await api(s, '/tanks', org.users.owner.token, { method: 'POST', body: JSON.stringify(sampleTank(siteId, { name })) })
  if (res.status !== 201) throw new Error(`tank ${name}: ${res.status} ${JSON.stringify(res.body)}`)
  return res.body as { id: number; targets: Record<string, { min: number; max: number }> }
}
type Task = { id: number; title: string; lastDoneAt: string | null }
const tasksOf = async (tankId: number) => (await api(s, `/tanks/${tankId}/care-tasks`, org.users.owner.token)).body as Task[]
const taskDoneLogs = async (tankId: number) =>
  ((await api(s, `/tanks/${tankId}/care-log`, org.users.owner.token)).body as Array<{ kind: string; careTaskId: number | null }>).filter(
    (e) => e.kind === 'task_done',
  )

/** Where an element sits in the page's viewport (boundingBox is relative to it). */
async function inViewport(page: Page, selector: string) {
  const box = await page.locator(selector).boundingBox()
  return { top: Math.round(box?.y ?? -1), height: page.viewportSize()?.height ?? 0 }
}

describe('Care today for someone on duty nowhere', () => {
  it('lists the due tasks of every site they may see and ticks two off at once, naming one a colleague did meanwhile', async () => {
    const shop = await newTank('Shop tank 1', org.siteIds[0])
    const room = await newTank('Room tank 1', org.siteIds[1])
    const roomTasks = await tasksOf(room.id)
    const shopTasks = await tasksOf(shop.id)
    // A brand-new tank's starter tasks are all due on its first day; the keeper has no duty at all.
    for (const siteId of org.siteIds) {
      const onDuty = (await api(s, `/sites/${siteId}/roster/on-duty`, org.users.keeper.token)).body.onDuty as Array<{ userId: number }>
      expect(onDuty.some((p) => p.userId === org.users.keeper.id)).toBe(false)
    }

    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/care/today`)
    await page.locator('[data-test=care-today-list]').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.locator('[data-test=care-today-off-duty]').innerText()).toContain('every site you can see is listed')
    expect(await page.locator('[data-test=care-today-empty]').count()).toBe(0)
    const places = await page.locator('[data-test=care-task-place]').allInnerTexts()
    expect(places.filter((p) => p.endsWith('· Shop tank 1'))).toHaveLength(shopTasks.length)
    expect(places.filter((p) => p.endsWith('· Room tank 1'))).toHaveLength(roomTasks.length)
    await shot(page, 'care-today-off-duty-phone')

    const [first, second] = [roomTasks[0]!, shopTasks[0]!]
    await page.locator(`[data-test=care-task-${first.id}] [data-test=care-task-select] input`).check()
    await page.locator(`[data-test=care-task-${second.id}] [data-test=care-task-select] input`).check()
    const button = page.locator('[data-test=care-today-done-selected]')
    expect(await button.innerText()).toMatch(/Mark 2 done/i)
    await shot(page, 'care-today-selected-phone')
    // The owner ticks the first one in the app while the keeper's list still shows it due.
    expect((await api(s, `/care-tasks/${first.id}/done`, org.users.owner.token, { method: 'POST', body: '{}' })).status).toBe(200)
    await button.click()
    const notice = await page.locator('[data-test=care-today-notice]').innerText()
    expect(notice).toContain('1 task done.')
    expect(notice).toMatch(
      new RegExp(`${first.title} on Room tank 1 was already done by owner of First Screens Org at \\d{1,2} \\w{3}, \\d{2}:\\d{2} (EST|EDT|GMT-[45])`),
    )
    expect(await page.locator(`[data-test=care-task-${first.id}]`).count()).toBe(0)
    expect(await page.locator(`[data-test=care-task-${second.id}]`).count()).toBe(0)
    expect(await page.locator('[data-test=care-task-place]').count()).toBe(places.length - 2)
    // Each task logged once: the owner's tick and the keeper's, not a second entry for the first.
    expect((await taskDoneLogs(room.id)).map((e) => e.careTaskId)).toEqual([first.id])
    expect((await taskDoneLogs(shop.id)).map((e) => e.careTaskId)).toEqual([second.id])
    await shot(page, 'care-today-done-phone')

    const desktop = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(desktop, s.baseUrl, org.users.keeper.email)
    await desktop.goto(`${s.baseUrl}/care/today`)
    await desktop.locator('[data-test=care-today-list]').waitFor({ timeout: FIRST_LOAD_MS })
    await shot(desktop, 'care-today-off-duty-desktop')
    await Promise.all([page.close(), desktop.close()])
  })
})

describe('a test-kit entry on a phone', () => {
  it('brings the saved result into view with a verdict per value, flagging ammonia in an established tank', async () => {
    const tank = await newTank('Display 60')
    // The starting band of a tropical tank: ammonia reads zero once cycled (common practice).
    expect(tank.targets.ammonia).toEqual({ min: 0, max: 0.02 })
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tank.id}/test-kit`)
    await page.locator('input[name=ammonia]').waitFor({ timeout: FIRST_LOAD_MS })
    await page.locator('input[name=temperature]').fill('25.5')
    await page.locator('input[name=ph]').fill('7.0')
    await page.locator('input[name=ammonia]').fill('0.25')
    await page.locator('[data-test=kit-save]').scrollIntoViewIfNeeded()
    await shot(page, 'test-kit-before-save-phone')
    await page.locator('[data-test=kit-save]').click()
    await page.locator('[data-test=verdict-ammonia]').waitFor()

    let box = await inViewport(page, '[data-test=verdict-ammonia]')
    for (let i = 0; i < 20 && (box.top < 0 || box.top >= box.height); i++) {
      await page.waitForTimeout(100)
      box = await inViewport(page, '[data-test=verdict-ammonia]')
    }
    expect(box.top).toBeGreaterThanOrEqual(0)
    expect(box.top).toBeLessThan(box.height)
    expect(await page.evaluate("document.activeElement && document.activeElement.getAttribute('data-test')")).toBe('kit-result')

    const ammonia = page.locator('[data-test=verdict-ammonia]')
    expect(await ammonia.getAttribute('data-level')).toBe('act')
    expect(await ammonia.locator('[data-test=verdict-summary]').innerText()).toBe('0.25 mg/L: above the target band 0–0.02 mg/L.')
    expect(await ammonia.locator('[data-test=verdict-advice]').innerText()).toContain('Change 25–50 % of the water')
    expect(await page.locator('[data-test=verdict-ph]').getAttribute('data-level')).toBe('ok')
    expect(await page.locator('[data-test=verdict-temperature]').getAttribute('data-level')).toBe('ok')
    expect(await page.locator('[data-test=verdict-caution]').innerText()).toContain('aquatic veterinarian')
    expect(await page.locator('[data-test=verdict-caution]').innerText()).toContain('product label')
    await shot(page, 'test-kit-verdict-phone')
    await page.locator('[data-test=verdict-caution]').scrollIntoViewIfNeeded()
    await shot(page, 'test-kit-verdict-caution-phone')

    const desktop = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(desktop, s.baseUrl, org.users.keeper.email)
    await desktop.goto(`${s.baseUrl}/tanks/${tank.id}/test-kit`)
    await desktop.locator('input[name=ammonia]').waitFor({ timeout: FIRST_LOAD_MS })
    await desktop.locator('input[name=nitrite]').fill('0.5')
    await desktop.locator('input[name=nitrate]').fill('20')
    await desktop.locator('[data-test=kit-save]').click()
    await desktop.locator('[data-test=verdict-nitrite]').waitFor()
    expect(await desktop.locator('[data-test=verdict-nitrite]').getAttribute('data-level')).toBe('act')
    await shot(desktop, 'test-kit-verdict-desktop')
    await Promise.all([page.close(), desktop.close()])
  })
})
