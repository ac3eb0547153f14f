import type { Browser, BrowserContext, Locator, Page } from 'playwright-core'
import { describeViolations, unnamedIconButtons, wcagViolations } from './axe'
import { shot, signIn } from './browser'
import { FIRST_LOAD_MS } from './keeper-setup'

// How the accessibility audits open a screen, check it and record which route it was.

export const SIZES = { desktop: { width: 1280, height: 800 }, phone: { width: 390, height: 844 } }
export type Size = keyof typeof SIZES
export type Theme = 'light' | 'dark'
/** Every size in both themes. */
export const SIZE_THEMES: Array<[Size, Theme]> = [
  ['desktop', 'light'],
  ['desktop', 'dark'],
  ['phone', 'dark'],
  ['phone', 'light'],
]

export async function newContext(browser: Browser, size: Size, theme: Theme): Promise<BrowserContext> {
  // The app follows the device's colour scheme until someone picks a theme. The page's CSP allows
  // only its own scripts; the audit engine is added from outside it, so this context bypasses it.
  return browser.newContext({ viewport: SIZES[size], colorScheme: theme, reducedMotion: 'reduce', bypassCSP: true })
}

// Requests a page has started and not yet finished, kept per page from its first `settle`.
const inFlight = new WeakMap<Page, Set<string>>()
function requestsOf(page: Page): Set<string> {
  let open = inFlight.get(page)
  if (!open) {
    const pending = new Set<string>()
    page.on('request', (r) => pending.add(`${r.method()} ${r.url()}`))
    page.on('requestfinished', (r) => pending.delete(`${r.method()} ${r.url()}`))
    page.on('requestfailed', (r) => pending.delete(`${r.method()} ${r.url()}`))
    inFlight.set(page, pending)
    open = pending
  }
  return open
}

// In the page: its fonts are in, no skeleton waits for data, and no transition or animation runs
// (an element half-faded in would be measured at half its contrast).
const STILL = `document.readyState === 'complete' && document.fonts.status === 'loaded' &&
  !document.querySelector('.v-skeleton-loader') && document.getAnimations().every((a) => a.playState !== 'running')`

/**
 * Waits until the page has settled: no request of its own in flight and the page still (above) for
 * 150 ms on end, then two frames so the last change is painted.
 */
export async function settle(page: Page, timeout = FIRST_LOAD_MS) {
  const pending = requestsOf(page)
  const deadline = Date.now() + timeout
  let stillSince = 0
  for (;;) {
    const still = pending.size === 0 && ((await page.evaluate(STILL)) as boolean)
    if (!still) stillSince = 0
    else if (!stillSince) stillSince = Date.now()
    else if (Date.now() - stillSince >= 150) break
    if (Date.now() > deadline) throw new Error(`${page.url()} did not settle within ${timeout} ms; in flight: ${[...pending].join(', ') || 'none'}`)
    await page.waitForTimeout(40)
  }
  await page.evaluate('new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r)))')
}

/** Loads a screen afresh and waits until its data has arrived and it has settled. */
export async function open(page: Page, url: string) {
  requestsOf(page)
  await page.goto(url, { timeout: FIRST_LOAD_MS })
  await page.locator('h1, form, main').first().waitFor({ timeout: FIRST_LOAD_MS })
  await settle(page)
}

const APP = `document.querySelector('#app').__vue_app__`

/** Moves to `path` through the app's own router, as a click on a link does: the client is not loaded again. */
export async function go(page: Page, path: string) {
  await page.evaluate(`${APP}.config.globalProperties.$router.push(${JSON.stringify(path)})`)
  await page.locator('h1, form, main').first().waitFor({ timeout: FIRST_LOAD_MS })
  await settle(page)
}

/** The name of the route the app's own router is showing. */
export const currentRouteName = (page: Page): Promise<string | null> =>
  page.evaluate(`${APP}.config.globalProperties.$router.currentRoute.value.name ?? null`) as Promise<string | null>

/** Gives the page the other size without loading it again, and waits until it has settled. */
async function resize(page: Page, size: Size) {
  await page.setViewportSize(SIZES[size])
  await settle(page)
}

/**
 * Checks the page as it is now: axe's WCAG 2.1 A/AA rules, and every icon-only button named. Adds
 * what it finds to `found` under `label`, keeps a screenshot of a failure, and answers the route shown.
 */
export async function checkPage(page: Page, label: string, found: string[]): Promise<string | null> {
  const violations = await wcagViolations(page)
  const before = found.length
  if (violations.length) found.push(`${label}:\n${describeViolations(violations)}`)
  const unnamed = await unnamedIconButtons(page)
  if (unnamed.length) found.push(`${label}: icon-only buttons without a name saying what they do: ${unnamed.join(' | ')}`)
  // Said at once, so a later step that fails does not hide what this one found.
  for (const finding of found.slice(before)) console.log(finding)
  // A screenshot of what failed; of every check with A11Y_SHOTS=1 (each costs about a tenth of a check).
  if (found.length > before || process.env.A11Y_SHOTS) await shot(page, `a11y-${label.replace(/\W+/g, '-')}`)
  return currentRouteName(page)
}

/** Opens `url` and checks it; answers the route shown. */
export async function audit(page: Page, label: string, url: string, found: string[]): Promise<string | null> {
  await open(page, url)
  return checkPage(page, `${label}${new URL(url).pathname}`, found)
}

const THEMES: Theme[] = ['light', 'dark']
const sizeOf = (page: Page): Size => (page.viewportSize()?.width === SIZES.phone.width ? 'phone' : 'desktop')

/**
 * Audits screens in every size and theme with two pages of one browser context, one per theme: the
 * app follows the device's colour scheme (nobody has picked a theme here), so each page keeps its
 * theme across loads and neither is ever restyled. A screen or dialog is opened once per page and
 * checked at the size the page has, then at the other (a resize, not a new load). One sign-in serves
 * both pages (the session is kept in the context's storage). Findings collect in `found`, the routes
 * shown in `visited`.
 */
export class LookAuditor {
  readonly found: string[] = []
  readonly visited = new Set<string | null>()

  private constructor(readonly pages: Record<Theme, Page>) {}

  static async start(browser: Browser): Promise<{ context: BrowserContext; auditor: LookAuditor }> {
    const context = await newContext(browser, 'desktop', 'light')
    const light = await context.newPage()
    const dark = await context.newPage()
    await dark.emulateMedia({ colorScheme: 'dark', reducedMotion: 'reduce' })
    return { context, auditor: new LookAuditor({ light, dark }) }
  }

  /** Signs in on the light page; the dark page takes up the session the context keeps. */
  async signIn(baseUrl: string, email: string) {
    await signIn(this.pages.light, baseUrl, email)
    await open(this.pages.dark, `${baseUrl}/`)
  }

  /** Runs `step` on each page in turn, that page in front. */
  async each(step: (page: Page, theme: Theme) => Promise<unknown>) {
    for (const theme of THEMES) {
      await this.pages[theme].bringToFront()
      await step(this.pages[theme], theme)
    }
  }

  /** Checks one page as it is now, at its size and then at the other; `inView` is scrolled into view first at each. */
  private async bothSizes(page: Page, theme: Theme, label: string, inView?: (page: Page) => Locator): Promise<string | null> {
    const first = sizeOf(page)
    let route: string | null = null
    for (const size of [first, first === 'desktop' ? 'phone' : 'desktop'] as Size[]) {
      if (size !== first) await resize(page, size)
      if (inView) await inView(page).scrollIntoViewIfNeeded({ timeout: FIRST_LOAD_MS })
      route = await checkPage(page, `${size}-${theme}-${label}`, this.found)
    }
    return route
  }

  /** Checks both pages as they are now in all four looks. */
  async checkEveryLook(label: string, inView?: (page: Page) => Locator) {
    await this.each((page, theme) => this.bothSizes(page, theme, label, inView))
  }

  /** Loads `url` afresh in both pages (a screen reached from outside the app: a mail link, the sign-in page) and checks it. */
  async load(url: string) {
    await this.each(async (page, theme) => {
      await open(page, url)
      this.visited.add(await this.bothSizes(page, theme, new URL(url).pathname))
    })
  }

  /** Moves both pages to `path` inside the app and checks it. */
  async visit(path: string) {
    await this.each(async (page, theme) => {
      await go(page, path)
      this.visited.add(await this.bothSizes(page, theme, path))
    })
  }

  /**
   * Opens a dialog or menu with `trigger` in each page, checks it there in both sizes, and closes it
   * again with its Cancel, Keep or Close button, or Escape (`close: false` leaves it open).
   */
  async overlay(label: string, trigger: (page: Page) => Promise<unknown>, { close = true, inside = '.v-card' } = {}) {
    await this.each(async (page, theme) => {
      // The new overlay comes after those already open (a dialog opened from a dialog).
      const overlay = page.locator('.v-overlay--active').nth(await page.locator('.v-overlay--active').count())
      await trigger(page)
      await overlay.locator(inside).first().waitFor({ timeout: FIRST_LOAD_MS })
      await settle(page)
      await this.bothSizes(page, theme, label)
      if (close) await closeOverlay(page, overlay)
    })
  }
}

/** Closes an open dialog or menu the way a person would, and waits until it has gone. */
export async function closeOverlay(page: Page, overlay: Locator) {
  const cancel = overlay.getByRole('button', { name: /^(Cancel|Keep|Close|I have saved the token)$/ })
  if (await cancel.count()) await cancel.last().click()
  else await page.keyboard.press('Escape')
  await overlay.waitFor({ state: 'hidden', timeout: FIRST_LOAD_MS })
  await settle(page)
}
