import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'
import { CHROMIUM_FLAGS } from '../../scripts/lib/chromium.mjs'
import { startTestServer } from '../helpers/server'
import { TEST_PASSWORD } from '../helpers/fixtures'

export const SCREENSHOTS = join(process.cwd(), 'test-results', 'screenshots')

/** Debian's chromium, headless, with a fresh profile; the flags keep it off the closed network. */
export async function launchBrowser(): Promise<{ browser: Browser; close: () => Promise<void> }> {
  // Playwright gives each launch a fresh temporary profile of its own.
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    headless: true,
    args: CHROMIUM_FLAGS,
  })
  return {
    browser,
    async close() {
      await browser.close()
    },
  }
}

/** The whole app (built client included) on free ports over a private database. */
export async function startAppForBrowser() {
  // Many sign-ins from one address in a few minutes: the sign-in limit is not what these tests are about.
  const server = await startTestServer({ serveClient: true, signInLimit: 10_000, mail: { fakeSmtpPort: 0, from: 'e2e@tankwarden.invalid' } })
  mkdirSync(SCREENSHOTS, { recursive: true })
  return server
}

/**
 * Signs in through the form. On a busy two-core machine a first load can stall (a request stuck
 * behind the other suites); then the page is loaded afresh once, and a second failure says what
 * the page showed, which requests did not finish, and where its screenshot is.
 */
export async function signIn(page: Page, baseUrl: string, email: string, password = TEST_PASSWORD) {
  const unfinished = new Set<string>()
  const consoleErrors: string[] = []
  page.on('request', (r) => unfinished.add(`${r.method()} ${r.url()}`))
  page.on('requestfinished', (r) => unfinished.delete(`${r.method()} ${r.url()}`))
  page.on('requestfailed', (r) => unfinished.delete(`${r.method()} ${r.url()}`))
  page.on('console', (m) => m.type() === 'error' && consoleErrors.push(m.text()))
  for (let attempt = 1; ; attempt++) {
    try {
      await page.goto(`${baseUrl}/sign-in`, { timeout: 25_000 })
      await page.getByLabel('E-mail').fill(email, { timeout: 20_000 })
      await page.getByLabel('Password', { exact: true }).fill(password)
      await page.getByRole('button', { name: 'Sign in' }).click()
      await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 25_000, waitUntil: 'commit' })
      return
    } catch (error) {
      if (attempt < 2 && !page.isClosed()) continue
      const alert = await page
        .locator('[data-test="sign-in-error"]')
        .textContent({ timeout: 1000 })
        .catch(() => null)
      const name = `sign-in-failed-${Date.now()}`
      await shot(page, name).catch(() => undefined)
      throw new Error(
        `sign-in as ${email} failed twice at ${page.url()}${alert ? `: ${alert.trim()}` : ''} (${(error as Error).message}); ` +
          `unfinished requests: ${[...unfinished].join(', ') || 'none'}; console errors: ${consoleErrors.join(' | ') || 'none'}; screenshot ${name}.png`,
        { cause: error },
      )
    }
  }
}

export const shot = (page: Page, name: string) => page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: false })
