import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { PublicTestKitEntry } from '@shared/schemas/test-kit'
import { createIncidentRow, TEST_PASSWORD, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, startAppForBrowser } from './browser'
import { api, FIRST_LOAD_MS, tankWithProbe, type App } from './keeper-setup'

// Keyboard only: Tab moves between controls, typing fills them, Enter acts. Every control reached on
// the way must show where the focus is (WCAG 2.1 success criteria 2.1.1 Keyboard and 2.4.7 Focus
// Visible, W3C, 2018).

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
let incidentId: number

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Keyboard Reef Works')
  tankId = (await tankWithProbe(s, org.users.owner.token, org.siteIds[0], 'Planted nano')).tankId
  const incident = await createIncidentRow(s.ctx, org, tankId, {
    ruleKind: 'below',
    metric: 'ph',
    severity: 'warning',
    title: 'pH below 6.0',
    firstValue: 5.9,
    peakValue: 5.9,
    latestValue: 5.9,
  })
  incidentId = incident.id
  const task = await api(s, `/tanks/${tankId}/care-tasks`, org.users.owner.token, {
    method: 'POST',
    body: JSON.stringify({ kind: 'other', title: 'Rinse the filter sponge', recurrence: { kind: 'interval', everyDays: 1 } }),
  })
  expect(task.status, JSON.stringify(task.body)).toBe(201)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

interface Focused {
  name: string
  tag: string
  visible: boolean
}

/** The focused element's accessible name as a screen reader would mostly get it, and whether its focus shows. */
const focused = (page: Page): Promise<Focused> =>
  // Runs in the page (the server tsconfig has no DOM types, so the script is text).
  page.evaluate(`(() => {
    const el = document.activeElement
    if (!el || el === document.body) return { name: '', tag: 'body', visible: false }
    const byIds = el.getAttribute('aria-labelledby')?.split(' ').map((id) => document.getElementById(id)?.textContent ?? '').join(' ')
    const name = (el.getAttribute('aria-label') || byIds || el.labels?.[0]?.textContent || el.textContent || '').trim()
    // A Vuetify field shows its focus on the field around the input; links and buttons (a field's
    // own "Show password" too) on an outline.
    const field = el.matches('input, textarea, select') ? el.closest('.v-field') : null
    const visible = field ? field.classList.contains('v-field--focused') : el.matches(':focus-visible') && getComputedStyle(el).outlineStyle !== 'none'
    return { name, tag: el.tagName.toLowerCase(), visible }
  })()`) as Promise<Focused>

/**
 * Presses Tab until the focus is on a control named `name`; every stop on the way must show its
 * focus. A control that already has the focus (a form's first field focuses itself) needs no Tab.
 */
async function tabTo(page: Page, name: string, maxStops = 80) {
  if ((await focused(page)).name === name) return
  const stops: Focused[] = []
  for (let i = 0; i < maxStops; i++) {
    await page.keyboard.press('Tab')
    const now = await focused(page)
    stops.push(now)
    if (now.name === name) break
  }
  const last = stops.at(-1)
  expect(last?.name, `Tab never reached "${name}"; stops: ${stops.map((f) => f.name).join(' → ')}`).toBe(name)
  expect(
    stops.filter((f) => !f.visible).map((f) => `${f.tag} "${f.name}"`),
    'controls without a visible focus',
  ).toEqual([])
}

async function signInByKeyboard(page: Page, email: string) {
  await page.goto(`${s.baseUrl}/sign-in`, { timeout: FIRST_LOAD_MS })
  await page.locator('form').waitFor({ timeout: FIRST_LOAD_MS })
  // The form focuses its e-mail field once it is on screen; a Tab pressed before that lands elsewhere.
  await expect.poll(async () => (await focused(page)).name, { timeout: FIRST_LOAD_MS }).toBe('E-mail')
  await page.keyboard.type(email)
  await tabTo(page, 'Password')
  await page.keyboard.type(TEST_PASSWORD)
  await page.keyboard.press('Enter')
  // Keepers land on the overview.
  await page.waitForURL((url) => url.pathname === '/', { timeout: FIRST_LOAD_MS })
}

describe('keyboard only', () => {
  it('signs in with Tab, typing and Enter', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signInByKeyboard(page, org.users.keeper.email)
    await page.locator('h1', { hasText: 'Overview' }).waitFor({ timeout: FIRST_LOAD_MS })
    await page.close()
  })

  it('saves a test-kit entry without a pointer', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signInByKeyboard(page, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}/test-kit`, { timeout: FIRST_LOAD_MS })
    await page.locator('form.tw-kit-form').waitFor({ timeout: FIRST_LOAD_MS })
    await tabTo(page, 'pH')
    await page.keyboard.type('7.2')
    await tabTo(page, 'Save test-kit entry')
    await shot(page, 'keyboard-test-kit-save-focused')
    const saved = page.waitForResponse((r) => r.url().endsWith(`/api/v1/tanks/${tankId}/test-kit-entries`) && r.request().method() === 'POST')
    await page.keyboard.press('Enter')
    expect((await saved).status()).toBe(201)
    const entries = await api(s, `/tanks/${tankId}/test-kit-entries`, org.users.keeper.token)
    expect(entries.status).toBe(200)
    expect((entries.body as PublicTestKitEntry[]).map((e) => e.values.map((v) => [v.metric, v.value]))).toEqual([[['ph', 7.2]]])
    await page.close()
  })

  it('acknowledges and resolves an incident without a pointer', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signInByKeyboard(page, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/incidents/${incidentId}`, { timeout: FIRST_LOAD_MS })
    await page.locator('[data-test=acknowledge]').waitFor({ timeout: FIRST_LOAD_MS })
    const stateOf = async () => (await api(s, `/incidents/${incidentId}`, org.users.keeper.token)).body.state

    await tabTo(page, 'Acknowledge')
    await page.keyboard.press('Enter')
    const dialog = page.locator('[data-test=handle-dialog]')
    await dialog.waitFor()
    // The note field takes the focus as the dialog opens.
    await expect.poll(async () => (await focused(page)).name).toBe('Note (optional), e.g. On my way')
    await page.keyboard.type('On my way')
    await tabTo(page, 'Acknowledge')
    await page.keyboard.press('Enter')
    await dialog.waitFor({ state: 'hidden' })
    await expect.poll(stateOf).toBe('acknowledged')

    await tabTo(page, 'Resolve')
    await page.keyboard.press('Enter')
    await dialog.waitFor()
    await expect.poll(async () => (await focused(page)).name).toBe('What was done')
    await page.keyboard.type('Buffered the water back to pH 6.8')
    await tabTo(page, 'Resolve')
    await shot(page, 'keyboard-incident-resolve-focused')
    await page.keyboard.press('Enter')
    await dialog.waitFor({ state: 'hidden' })
    await expect.poll(stateOf).toBe('resolved')
    await page.close()
  })

  it('ticks a care task done without a pointer', async () => {
    const page = await browser.newPage({ viewport: { width: 390, height: 844 } })
    await signInByKeyboard(page, org.users.keeper.email)
    // Care today remembers its scope in the browser; choose the site with the task.
    await page.evaluate(`localStorage.setItem('tw.careTodayScope', '${org.siteIds[0]}')`)
    await page.goto(`${s.baseUrl}/care/today`, { timeout: FIRST_LOAD_MS })
    // A new tank comes with its starter care tasks besides the one made here; each Done says which.
    await page.locator('[data-test=care-task-done]').first().waitFor({ timeout: FIRST_LOAD_MS })
    await tabTo(page, 'Done: Clean the glass')
    await page.keyboard.press('Enter')
    const doneTitles = async () =>
      ((await api(s, `/tanks/${tankId}/care-tasks`, org.users.keeper.token)).body as Array<{ title: string; lastDoneAt: string | null }>)
        .filter((t) => t.lastDoneAt !== null)
        .map((t) => t.title)
    await expect.poll(doneTitles).toEqual(['Clean the glass'])
    await page.close()
  })

  it('plans a water change on the tank page without a pointer', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signInByKeyboard(page, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`, { timeout: FIRST_LOAD_MS })
    const panel = page.locator('[data-test=water-change-panel]')
    await panel.locator('[data-test=water-change-plan-button]').waitFor({ timeout: FIRST_LOAD_MS })
    // The planner sits below the readings, the rules and the care panels: a long way by Tab.
    await tabTo(page, 'Share of the water', 300)
    await page.keyboard.type('25')
    await tabTo(page, 'Work out the change')
    await page.keyboard.press('Enter')
    await panel.locator('[data-test=water-change-plan]').waitFor({ timeout: FIRST_LOAD_MS })
    await shot(page, 'keyboard-water-change-planned')
    await page.close()
  })
})
