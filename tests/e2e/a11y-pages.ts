import type { Browser, BrowserContext, Page } from 'playwright-core'
import { describeViolations, unnamedIconButtons, wcagViolations } from './axe'
import { shot } from './browser'
import { FIRST_LOAD_MS } from './keeper-setup'

// How the accessibility audits open a screen, check it and record which route it was.

export const SIZES = { desktop: { width: 1280, height: 800 }, phone: { width: 390, height: 844 } }
export type Size = keyof typeof SIZES
export type Theme = 'light' | 'dark'
export const SIZE_THEMES: Array<[Size, Theme]> = [
  ['desktop', 'light'],
  ['phone', 'light'],
  ['desktop', 'dark'],
  ['phone', 'dark'],
]

export async function newContext(browser: Browser, size: Size, theme: Theme): Promise<BrowserContext> {
  // The app follows the device's colour scheme until someone picks a theme. The page's CSP allows
  // only its own scripts; the audit engine is added from outside it, so this context bypasses it.
  return browser.newContext({ viewport: SIZES[size], colorScheme: theme, reducedMotion: 'reduce', bypassCSP: true })
}

/** Loads a screen and waits until its data has arrived and its entrance transitions are over. */
export async function open(page: Page, url: string) {
  await page.goto(url, { timeout: FIRST_LOAD_MS })
  await page.waitForLoadState('networkidle', { timeout: FIRST_LOAD_MS }).catch(() => undefined)
  await page.locator('h1, form, main').first().waitFor({ timeout: FIRST_LOAD_MS })
  // Vuetify fades cards and fields in; an element half-faded would be measured at half its contrast.
  await page.waitForTimeout(400)
}

/** The name of the route the app's own router is showing. */
export const currentRouteName = (page: Page): Promise<string | null> =>
  page.evaluate(`document.querySelector('#app').__vue_app__.config.globalProperties.$router.currentRoute.value.name ?? null`) as Promise<string | null>

/**
 * Checks the page as it is now: axe's WCAG 2.1 A/AA rules, and every icon-only button named. Adds
 * what it finds to `found` under `label`, keeps a screenshot, and answers the route shown.
 */
export async function checkPage(page: Page, label: string, found: string[]): Promise<string | null> {
  const violations = await wcagViolations(page)
  const before = found.length
  if (violations.length) found.push(`${label}:\n${describeViolations(violations)}`)
  const unnamed = await unnamedIconButtons(page)
  if (unnamed.length) found.push(`${label}: icon-only buttons without a name saying what they do: ${unnamed.join(' | ')}`)
  // Said at once, so a later step that fails does not hide what this one found.
  for (const finding of found.slice(before)) console.log(finding)
  await shot(page, `a11y-${label.replace(/\W+/g, '-')}`)
  return currentRouteName(page)
}

/** Opens `url` and checks it; answers the route shown. */
export async function audit(page: Page, label: string, url: string, found: string[]): Promise<string | null> {
  await open(page, url)
  return checkPage(page, `${label}${new URL(url).pathname}`, found)
}
