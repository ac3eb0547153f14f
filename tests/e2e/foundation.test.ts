import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { tanksService } from '../../server/tanks/tanks'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'

let s: Awaited<ReturnType<typeof startAppForBrowser>>
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Browser Org')
  const owner = {
    kind: 'user' as const,
    userId: org.users.owner.id,
    organizationId: org.organizationId,
    role: 'owner' as const,
    siteIds: null,
    sessionId: 'seed',
  }
  for (const name of ['Display tank', 'Quarantine tub']) {
    await tanksService(s.ctx).create(owner, sampleTank(org.siteIds[0], { name }) as never)
  }
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

describe('signing in and the tanks table, in Chromium', () => {
  it('shows the owner the tanks table with a New tank button', async () => {
    const page = await browser.newPage({ viewport: { width: 1920, height: 1080 } })
    await signIn(page, s.baseUrl, org.users.owner.email)
    await page.goto(`${s.baseUrl}/tanks`)
    await expect.poll(() => page.getByText('Display tank').count(), { timeout: 20_000 }).toBeGreaterThan(0)
    expect(await page.getByText('Quarantine tub').count()).toBeGreaterThan(0)
    expect(
      await page
        .getByRole('link', { name: /New tank/ })
        .or(page.getByRole('button', { name: /New tank/ }))
        .count(),
    ).toBeGreaterThan(0)
    await shot(page, 'tanks-owner')
    await page.close()
  })

  it('shows a viewer no edit controls, and the API refuses a viewer write with 403', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } })
    await signIn(page, s.baseUrl, org.users.viewer.email)
    await page.goto(`${s.baseUrl}/tanks`)
    await expect.poll(() => page.getByText('Display tank').count(), { timeout: 20_000 }).toBeGreaterThan(0)
    expect(await page.getByText('New tank').count()).toBe(0)
    const status = await page.evaluate(async (siteId) => {
      const token = (globalThis as unknown as { localStorage: { getItem(k: string): string | null } }).localStorage.getItem('tw.token')
      const res = await fetch('/api/v1/tanks', {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
        body: JSON.stringify({ name: 'x', siteId, kind: 'marine', stage: 'established', volumeLitres: 10 }),
      })
      return res.status
    }, org.siteIds[0])
    expect(status).toBe(403)
    await shot(page, 'tanks-viewer')
    await page.close()
  })
})
