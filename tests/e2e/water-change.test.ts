import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { HEATER_OFF_CAUTION } from '@shared/chemistry/water-change'
import { TEMPORARY_RULE_NAME } from '../../server/care/water-changes'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, writeStorage, type App } from './keeper-setup'

// The sample tank is 100 × 40 × 50 cm with the heater top at 30 cm; with no level reading it is
// taken to be filled to 45 cm (90 %, our `common practice` assumption): 4 L per cm, 180 L.
// 40 % is 72 L = 18 cm, leaving 27 cm: below the heater top. 10 % is 18 L = 4.5 cm: covered.
let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
const DAY_MS = 86_400_000

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Water Change Browser Org')
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

async function newTank(name: string, overrides: Record<string, unknown> = {}) {
  const res = await api(s, '/tanks', org.users.owner.token, {
    method: 'POST',
    body: JSON.stringify(sampleTank(org.siteIds[0] as number, { name, ...overrides })),
  })
  if (res.status !== 201) throw new Error(`tank ${name}: ${res.status} ${JSON.stringify(res.body)}`)
  return res.body.id as number
}
/** A temperature reading every 10 minutes for the last 6 hours, so the charts draw. */
const temperatures = (tankId: number) =>
  s.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'i:e2e-wc', 'temperature', date_trunc('minute', now()) - m * interval '10 minutes', $1, 25.5, 'import' FROM generate_series(0, 35) AS m`,
    { bind: [tankId] },
  )
const temporaryRules = async (tankId: number) =>
  (
    (await api(s, `/tanks/${tankId}/rules`, org.users.keeper.token)).body as Array<{ id: number; name: string; enabled: boolean; spec: { kind: string } }>
  ).filter((r) => r.name === TEMPORARY_RULE_NAME)
const waterTask = async (tankId: number) =>
  (
    (await api(s, `/tanks/${tankId}/care-tasks`, org.users.keeper.token)).body as Array<{ kind: string; lastDoneAt: string | null; due: { status: string } }>
  ).find((t) => t.kind === 'water_change')!

async function plan(page: Page, percent: string) {
  const panel = page.locator('[data-test=water-change-panel]')
  await panel.locator('input[name=amount]').fill(percent)
  await panel.locator('[data-test=water-change-plan-button]').click()
  await panel.locator('[data-test=water-change-plan]').waitFor()
  return panel
}

describe('a water change from the tank page', () => {
  it('asks for the heater off when the plan uncovers it, arms the heater-line rule, finishes into the log, the task and the chart', async () => {
    const tankId = await newTank('Display 40')
    await temperatures(tankId)
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.locator('[data-test=water-change-panel] input[name=amount]').waitFor({ timeout: FIRST_LOAD_MS })

    const panel = await plan(page, '40')
    expect(await panel.locator('[data-test=plan-litres]').innerText()).toContain('72 L (40 % of 180 L)')
    expect(await panel.locator('[data-test=plan-level]').innerText()).toBe('27 cm')
    expect(await panel.locator('[data-test=plan-heater]').innerText()).toContain('the heater would be out of the water')
    expect(await panel.locator('[data-test=plan-cautions]').innerText()).toContain(HEATER_OFF_CAUTION)

    await panel.locator('[data-test=water-change-start]').click()
    const dialog = page.locator('[data-test=heater-confirm-dialog]')
    await dialog.waitFor()
    expect(await dialog.locator('[data-test=heater-confirm-cautions]').innerText()).toContain(HEATER_OFF_CAUTION)
    const confirm = dialog.locator('[data-test=heater-confirm-start]')
    expect(await confirm.isDisabled()).toBe(true)
    await shot(page, 'water-change-heater-confirm')
    await dialog.getByLabel('The heater is switched off').check()
    expect(await confirm.isDisabled()).toBe(false)
    const started = page.waitForResponse((r) => r.url().endsWith(`/api/v1/tanks/${tankId}/water-changes`) && r.request().method() === 'POST')
    await confirm.click()
    const startAnswer = await started
    expect(startAnswer.status()).toBe(201)
    const change = (await startAnswer.json()) as { id: number; heaterOffConfirmed: boolean; temporaryRuleId: number }
    expect(change.heaterOffConfirmed).toBe(true)
    await panel.locator('[data-test=water-change-in-progress]').waitFor()

    const armed = await temporaryRules(tankId)
    expect(armed).toMatchObject([{ id: change.temporaryRuleId, enabled: true, spec: { kind: 'heater_line' } }])

    await panel.locator('[data-test=water-change-finish]').click()
    await page.locator('input[name=litresReplaced]').fill('70')
    await page.locator('input[name=dechlorinatorMl]').fill('14')
    await page.locator('[data-test=water-change-finish-save]').click()
    await panel.locator('[data-test=water-change-notice]').waitFor()
    expect(await panel.locator('[data-test=water-change-notice]').innerText()).toContain('70 L replaced')

    const log = (await api(s, `/tanks/${tankId}/care-log`, org.users.keeper.token)).body as Array<{
      kind: string
      values: Record<string, number>
      waterChangeId: number | null
    }>
    expect(log.filter((e) => e.kind === 'water_change')).toMatchObject([{ values: { litres: 70, dechlorinatorMl: 14 }, waterChangeId: change.id }])
    const task = await waterTask(tankId)
    expect(task.lastDoneAt).not.toBeNull()
    expect(task.due.status).toBe('later')
    expect(await temporaryRules(tankId)).toEqual([])
    // The care log panel lists it too.
    await expect.poll(async () => page.locator('body').innerText(), { timeout: 10_000 }).toContain('Water change')

    // The chart of the tank page draws the change as a marker line labelled with it.
    await page.reload()
    const chart = page.locator('[data-test=metric-panel-temperature] [role=img]')
    await expect.poll(async () => chart.locator('svg text').allTextContents(), { timeout: FIRST_LOAD_MS }).toContain('Water change')
    await shot(page, 'water-change-finished')
    await page.close()
  })

  it('starts a small change without the heater dialog and cancels it after a confirmation', async () => {
    const tankId = await newTank('Display 10')
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.locator('[data-test=water-change-panel] input[name=amount]').waitFor({ timeout: FIRST_LOAD_MS })
    const before = await waterTask(tankId)

    const panel = await plan(page, '10')
    expect(await panel.locator('[data-test=plan-heater]').innerText()).toContain('the heater stays covered')
    await panel.locator('[data-test=water-change-start]').click()
    await panel.locator('[data-test=water-change-in-progress]').waitFor()
    expect(await page.locator('[data-test=heater-confirm-dialog]').count()).toBe(0)
    const [rule] = await temporaryRules(tankId)
    expect(rule).toMatchObject({ enabled: true })

    await panel.locator('[data-test=water-change-cancel]').click()
    await page.locator('[data-test=water-change-cancel-keep]').click()
    await page.locator('[data-test=water-change-cancel-confirm]').waitFor({ state: 'hidden' })
    expect(await temporaryRules(tankId)).toHaveLength(1)

    await panel.locator('[data-test=water-change-cancel]').click()
    await page.locator('input[name=cancelReason]').fill('Customer at the counter')
    await shot(page, 'water-change-cancel-confirm')
    await page.locator('[data-test=water-change-cancel-confirm]').click()
    await panel.locator('[data-test=water-change-notice]').waitFor()
    expect(await panel.locator('[data-test=water-change-notice]').innerText()).toContain('logged as not done')
    expect(await panel.locator('[data-test=water-change-in-progress]').count()).toBe(0)

    expect(await temporaryRules(tankId)).toEqual([])
    const log = (await api(s, `/tanks/${tankId}/care-log`, org.users.keeper.token)).body as Array<{ kind: string; text: string }>
    expect(log).toMatchObject([{ kind: 'note', text: 'Water change cancelled (not done): Customer at the counter' }])
    const after = await waterTask(tankId)
    expect(after.lastDoneAt).toBe(before.lastDoneAt)
    expect(after.due).toEqual(before.due)
    await page.close()
  })
})

describe('care screens with real data', () => {
  it('shows the Care today list, an acclimation timer and a cycling status', async () => {
    const siteId = org.siteIds[0] as number
    // A new tank's starter tasks fall due on the day it is made.
    const showTank = await newTank('Care today show tank')
    const cycling = await newTank('Cycling tank C1', { stage: 'cycling' })
    const quarantine = await newTank('Quarantine Q3', { stage: 'quarantine' })
    await s.ctx.sequelize.query("UPDATE tanks SET stage_changed_at = now() - interval '5 days 1 hour' WHERE id = $1", { bind: [quarantine] })
    // A month of kit tests, one every second day: ammonia peaks, then nitrite, then both read zero
    // for the last 10 days with nitrate present (the 7-day rule of shared/care/cycling, common practice).
    const tests: Array<[number, number, number, number]> = [
      [30, 1, 0, 0],
      [28, 3, 0.25, 0],
      [26, 4, 1, 2],
      [24, 2, 3, 5],
      [22, 0.5, 4, 10],
      [20, 0.25, 2, 15],
      [18, 0, 1, 20],
      [16, 0, 0.5, 20],
      [14, 0, 0.25, 25],
      [10, 0, 0, 25],
      [8, 0, 0, 30],
      [6, 0, 0, 30],
      [4, 0, 0, 30],
      [2, 0, 0, 35],
      [0, 0, 0, 35],
    ]
    for (const [daysAgo, nh3, no2, no3] of tests) {
      const at = new Date(Date.now() - daysAgo * DAY_MS - 3_600_000)
      for (const [metric, value] of [
        ['ammonia', nh3],
        ['nitrite', no2],
        ['nitrate', no3],
      ] as const) {
        await s.ctx.sequelize.query(
          `INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ('i:e2e-cycle', $1, $2, $3, $4, 'import')`,
          { bind: [metric, at, cycling, value] },
        )
      }
    }

    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await writeStorage(page, 'tw.careTodayScope', String(siteId))
    await page.goto(`${s.baseUrl}/care/today`)
    const list = page.locator('[data-test=care-today-list]')
    await list.waitFor({ timeout: FIRST_LOAD_MS })
    const listed = await list.innerText()
    for (const name of ['Care today show tank', 'Cycling tank C1', 'Quarantine Q3']) expect(listed).toContain(name)
    const todayAnswer = (await api(s, `/care/today?siteId=${siteId}`, org.users.keeper.token)).body as { tasks: Array<{ tank: { id: number } }> }
    expect(todayAnswer.tasks.filter((t) => t.tank.id === showTank).length).toBeGreaterThan(0)
    const watch = page.locator(`[data-test=care-watch-${quarantine}]`)
    // Five days and an hour in: day 6 of 28, 23 days to go (rounded up).
    expect(await watch.innerText()).toContain('Quarantine day 6 of 28: 23 days remaining')
    await shot(page, 'care-today')

    await page.goto(`${s.baseUrl}/tanks/${cycling}`)
    const cyclingPanel = page.locator('[data-test=cycling-panel]')
    await cyclingPanel.locator('[data-test=cycling-cycled]').waitFor({ timeout: FIRST_LOAD_MS })
    expect(await cyclingPanel.locator('[data-test=cycling-cycled]').innerText()).toBe('Yes')
    expect(await cyclingPanel.locator('[data-test=cycling-ammonia]').innerText()).toMatch(/^4\b.*, passed$/)
    expect(await cyclingPanel.locator('[data-test=cycling-nitrite]').innerText()).toMatch(/^4\b.*, passed$/)
    expect(await cyclingPanel.locator('[data-test=cycling-nitrate]').innerText()).toBe('Yes')
    expect(await cyclingPanel.locator('[data-test=cycling-suggestion]').innerText()).toContain('set its stage to established')

    await page.goto(`${s.baseUrl}/tanks/${showTank}`)
    await page.locator('[data-test=livestock-add]').click({ timeout: FIRST_LOAD_MS })
    const picker = page.locator('[data-test=species-picker] input')
    await picker.click()
    await picker.fill('Zebra')
    await page.getByRole('option', { name: /Zebra danio/ }).click()
    await page.locator('input[name=count]').fill('6')
    await page.locator('input[name=bagLitres]').fill('0.5')
    const added = page.waitForResponse((r) => r.url().endsWith(`/api/v1/tanks/${showTank}/livestock`) && r.request().method() === 'POST')
    await page.locator('[data-test=livestock-save]').click()
    expect((await added).status()).toBe(201)
    const timer = page.locator('[data-test=acclimation-timer]')
    await timer.waitFor()
    expect(await timer.innerText()).toContain('6 × Zebra danio')
    expect(await timer.locator('[data-test^=acclimation-step-]').count()).toBe(6)
    await timer.locator('[data-test=acclimation-start]').click()
    await expect.poll(async () => timer.locator('[data-test=acclimation-countdown]').first().innerText()).toMatch(/\d/)
    await timer.scrollIntoViewIfNeeded()
    await shot(page, 'acclimation-timer')
    await page.close()
  })
})
