import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import { chromium, type Browser, type Page } from 'playwright-core'
import { startTestServer } from '../helpers/server'
import { TEST_PASSWORD } from '../helpers/fixtures'

export const SCREENSHOTS = join(process.cwd(), 'test-results', 'screenshots')

/** Debian's chromium, headless, with a fresh profile; the flags keep it off the closed network. */
export async function launchBrowser(): Promise<{ browser: Browser; close: () => Promise<void> }> {
  // Playwright gives each launch a fresh temporary profile of its own.
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-background-networking', '--disable-component-update',
      '--disable-sync', '--no-first-run', '--disable-quic',
    ],
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

export async function signIn(page: Page, baseUrl: string, email: string, password = TEST_PASSWORD) {
  await page.goto(`${baseUrl}/sign-in`)
  await page.getByLabel('E-mail').fill(email)
  await page.getByLabel('Password', { exact: true }).fill(password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  // A slow first load on a busy two-core machine; if it stays on the form, say what the form says.
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'), { timeout: 60_000, waitUntil: 'commit' }).catch(async (error) => {
    const alert = await page.locator('[data-test="sign-in-error"]').textContent().catch(() => null)
    throw new Error(`still on the sign-in page${alert ? `: ${alert.trim()}` : ''} (${(error as Error).message})`)
  })
}

export const shot = (page: Page, name: string) => page.screenshot({ path: join(SCREENSHOTS, `${name}.png`), fullPage: false })
