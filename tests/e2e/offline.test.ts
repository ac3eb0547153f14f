import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/fixtures'
import { describeViolations, wcagViolations } from './axe'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Offline Browser Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

type Task = { id: number; title: string; lastDoneAt: string | null }
const tasksOf = async (tankId: number) => (await api(s, `/tanks/${tankId}/care-tasks`, org.users.keeper.token)).body as Task[]
const rows = async (sql: string, bind: unknown[]) => (await s.ctx.sequelize.query(sql, { bind }))[0] as Array<Record<string, unknown>>
const kitRows = (tankId: number) => rows(`SELECT values, taken_at FROM test_kit_entries WHERE tank_id = $1`, [tankId])
const doneRows = (taskId: number) => rows(`SELECT user_id FROM care_log WHERE care_task_id = $1`, [taskId])

/** The keeper on a tank's page with its tasks listed: what a phone holds before the signal goes. */
async function keeperAtTank(context: BrowserContext, tankId: number): Promise<Page> {
  const page = await context.newPage()
  await signIn(page, s.baseUrl, org.users.keeper.email)
  await page.goto(`${s.baseUrl}/tanks/${tankId}`)
  await page.locator('[data-test="care-task-done"]').first().waitFor({ timeout: FIRST_LOAD_MS })
  return page
}

async function logPh(page: Page, value: string) {
  await page.locator('[data-test="log-test"]').click()
  await page.locator('input[name="ph"]').fill(value)
  await page.locator('form').getByRole('button', { name: 'Save test-kit entry' }).click()
}

const tick = (page: Page, title: string) =>
  page.locator('[data-test^="care-task-"]').filter({ hasText: title }).locator('[data-test="care-task-done"]').first().click()

describe('working without a connection', () => {
  it('keeps a test-kit entry, two ticks and a care-log note while offline, sends each once when back, and shows a tick someone else made as already done', async () => {
    const { tankId } = await tankWithProbe(s, org.users.owner.token, org.siteIds[0]!, 'Cave tank 7')
    const [first, second] = await tasksOf(tankId)
    // bypassCSP: the accessibility audit is added to the page from outside its content policy.
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 }, bypassCSP: true })
    const page = await keeperAtTank(context, tankId)
    // The test-kit page once while online, as a keeper who used it before.
    await page.locator('[data-test="log-test"]').click()
    await page.locator('input[name="ph"]').waitFor({ timeout: FIRST_LOAD_MS })
    await page.goBack()
    await page.locator('[data-test="care-task-done"]').first().waitFor()

    await context.setOffline(true)
    await page.locator('[data-test="offline-state"]').waitFor()
    const before = Date.now()
    await logPh(page, '7.4')
    await page.locator('[data-test="kit-kept"]').waitFor()
    await page.getByRole('link', { name: 'Back to the tank' }).click()
    // The tank page comes from this device's storage, and says how old it is.
    await page.locator('[data-test="offline-saved-age"]').waitFor()
    expect(await page.locator('[data-test="offline-saved-age"]').innerText()).toMatch(/Showing what this device saved (just now|\d+ min ago)\./)
    await tick(page, first!.title)
    await page.locator('[data-test="care-task-notice"]').filter({ hasText: 'kept on this device' }).waitFor()
    await tick(page, second!.title)
    await page.locator('[data-test="care-log-add"]').click()
    await page.locator('.v-dialog textarea[name="text"]').fill('Snail eggs on the glass')
    await page.locator('.v-dialog [data-test="log-save"]').click()
    await page.locator('[data-test="care-log-kept"]').waitFor()
    await page.locator('[data-test="offline-count"]').filter({ hasText: '4 waiting to send' }).waitFor()
    await page.locator('[data-test="offline-count"]').click()
    expect(await page.locator('[data-test="offline-item"]').allInnerTexts()).toEqual([
      expect.stringContaining('Test-kit entry · Cave tank 7: pH 7.4'),
      expect.stringContaining(`Done · Cave tank 7: ${first!.title}`),
      expect.stringContaining(`Done · Cave tank 7: ${second!.title}`),
      expect.stringContaining('Care log · Cave tank 7: Snail eggs on the glass'),
    ])
    // The banner and its list against WCAG 2.1 A and AA (W3C, 2018), with axe-core.
    const violations = await wcagViolations(page)
    expect(violations, describeViolations(violations)).toEqual([])
    await shot(page, 'offline-banner-desktop')
    await page.setViewportSize({ width: 390, height: 844 })
    await shot(page, 'offline-banner-phone')
    await page.setViewportSize({ width: 1280, height: 800 })

    // Meanwhile the owner, with a connection, ticks the second task.
    expect((await api(s, `/care-tasks/${second!.id}/done`, org.users.owner.token, { method: 'POST', body: '{}' })).status).toBe(200)
    expect(await kitRows(tankId)).toHaveLength(0)

    await context.setOffline(false)
    await page.locator('[data-test="offline-count"]').waitFor({ state: 'detached', timeout: 20_000 })
    const notice = page.locator('[data-test="offline-notice"]')
    expect(await notice.innerText()).toContain(`Done · Cave tank 7: ${second!.title}: Already done by owner of Offline Browser Org since you looked`)

    const kit = await kitRows(tankId)
    expect(kit).toHaveLength(1)
    expect(kit[0]!.values).toEqual([{ metric: 'ph', value: 7.4, unit: 'pH' }])
    // The time the keeper took it on the phone, not the time it arrived.
    // (the form takes the minute, as a keeper reads a clock)
    expect((kit[0]!.taken_at as Date).getTime()).toBeGreaterThanOrEqual(Math.floor(before / 60_000) * 60_000)
    expect((kit[0]!.taken_at as Date).getTime()).toBeLessThan(Date.now())
    expect(await doneRows(first!.id)).toEqual([{ user_id: org.users.keeper.id }])
    expect(await doneRows(second!.id)).toEqual([{ user_id: org.users.owner.id }])
    expect(await rows(`SELECT text FROM care_log WHERE tank_id = $1 AND kind = 'note'`, [tankId])).toEqual([{ text: 'Snail eggs on the glass' }])
    await context.close()
  })

  it('stores once when the answer to a send is lost and the entry is sent again', async () => {
    const { tankId } = await tankWithProbe(s, org.users.owner.token, org.siteIds[0]!, 'Breeder box 2')
    const [task] = await tasksOf(tankId)
    const context = await browser.newContext({ viewport: { width: 1280, height: 800 } })
    // The first send of each kind reaches the server, which stores it; its answer never comes back.
    const lost = new Set<string>()
    await context.route(/\/api\/v1\/(tanks\/\d+\/test-kit-entries|care-tasks\/\d+\/done)$/, async (route) => {
      const kind = route.request().url().includes('test-kit') ? 'kit' : 'done'
      if (route.request().method() !== 'POST' || lost.has(kind)) return route.continue()
      lost.add(kind)
      await route.fetch()
      await route.abort('connectionreset')
    })
    const page = await keeperAtTank(context, tankId)
    const sendAgain = async () => {
      await page.locator('[data-test="offline-count"]').filter({ hasText: '1 waiting to send' }).click()
      await page
        .locator('[data-test="offline-send-now"]')
        .click({ timeout: 10_000 })
        .catch(async (error: unknown) => {
          await shot(page, 'offline-send-again-failed')
          throw error
        })
      await page.locator('[data-test="offline-count"]').waitFor({ state: 'detached', timeout: 20_000 })
    }
    await tick(page, task!.title)
    await page.locator('[data-test="care-task-notice"]').filter({ hasText: 'kept on this device' }).waitFor()
    expect(await doneRows(task!.id)).toHaveLength(1)
    await sendAgain()
    expect(await doneRows(task!.id)).toHaveLength(1)

    await logPh(page, '6.9')
    await page.locator('[data-test="kit-kept"]').waitFor()
    expect(await kitRows(tankId)).toHaveLength(1)
    await sendAgain()
    expect(lost).toEqual(new Set(['kit', 'done']))
    expect(await kitRows(tankId)).toHaveLength(1)
    expect(await doneRows(task!.id)).toEqual([{ user_id: org.users.keeper.id }])
    await context.close()
  })

  it('keeps an entry the server refuses on arrival, with the reason, until it is discarded', async () => {
    const { tankId } = await tankWithProbe(s, org.users.owner.token, org.siteIds[0]!, 'Sump 3')
    const [task] = await tasksOf(tankId)
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    const page = await keeperAtTank(context, tankId)
    await context.setOffline(true)
    await page.locator('[data-test="offline-state"]').waitFor()
    await tick(page, task!.title)
    await page.locator('[data-test="care-task-notice"]').filter({ hasText: 'kept on this device' }).waitFor()
    // The owner switches the task off before the phone gets its signal back: the server refuses the tick.
    expect((await api(s, `/care-tasks/${task!.id}`, org.users.owner.token, { method: 'PATCH', body: '{"active":false}' })).status).toBe(200)
    await context.setOffline(false)
    await page.locator('[data-test="offline-count"]').filter({ hasText: '1 refused' }).click()
    expect(await page.locator('[data-test="offline-refused"]').innerText()).toBe('refused: id: this task is switched off')
    await shot(page, 'offline-refused-phone')
    await page.locator('[data-test="offline-discard"]').click()
    await page.locator('[data-test="offline-count"]').waitFor({ state: 'detached' })
    expect(await doneRows(task!.id)).toHaveLength(0)
    await context.close()
  })

  it('keeps a tick from Care today while offline and sends it once', async () => {
    const { tankId } = await tankWithProbe(s, org.users.owner.token, org.siteIds[1]!, 'Pond tub 5')
    const [task] = await tasksOf(tankId)
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } })
    const page = await context.newPage()
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/care/today`)
    const item = page.locator('[data-test="care-today-list"] [data-test^="care-task-"]').filter({ hasText: 'Pond tub 5' }).filter({ hasText: task!.title })
    await item.locator('[data-test="care-task-done"]').first().waitFor({ timeout: FIRST_LOAD_MS })
    await context.setOffline(true)
    await page.locator('[data-test="offline-state"]').waitFor()
    await item.locator('[data-test="care-task-done"]').first().click()
    expect(await page.locator('[data-test="care-today-notice"]').innerText()).toBe(
      `${task!.title} on Pond tub 5: kept on this device as done; sent when the connection returns.`,
    )
    expect(await doneRows(task!.id)).toHaveLength(0)
    await context.setOffline(false)
    await page.locator('[data-test="offline-count"]').waitFor({ state: 'detached', timeout: 20_000 })
    expect(await doneRows(task!.id)).toEqual([{ user_id: org.users.keeper.id }])
    await context.close()
  })
})
