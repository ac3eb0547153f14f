// The seeded demo in the browser: a month of history on a demo tank's chart, and last month's incidents.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser, Response } from 'playwright-core'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'
import { DEMO_PASSWORD, DEMO_USERS } from '../../server/demo/demo-scenario'
import { startTestServer } from '../helpers/server'
import { launchBrowser, shot, signIn } from './browser'

const DAY_MS = 86_400_000
let s: Awaited<ReturnType<typeof startTestServer>>
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let dataDir: string
let tankId: number

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-demo-e2e-'))
  s = await startTestServer({ serveClient: true, seedDemo: true, dataDir, signInLimit: 10_000, mail: { fakeSmtpPort: 0, from: 'e2e@tankwarden.invalid' } })
  b = await launchBrowser()
  browser = b.browser
  const [row] = await s.ctx.sequelize.query<{ id: number }>(`SELECT id FROM tanks WHERE name = 'Display 2 — planted scape'`, { type: QueryTypes.SELECT })
  tankId = row!.id
})
afterAll(async () => {
  await b?.close()
  await s?.close()
  rmSync(dataDir, { recursive: true, force: true })
})

describe('the seeded demo shop', () => {
  it('charts a month of a demo tank’s readings and lists the week’s incidents', async () => {
    for (const [name, viewport] of [
      ['desktop', { width: 1280, height: 800 }],
      ['phone', { width: 390, height: 844 }],
    ] as const) {
      const page = await browser.newPage({ viewport })
      await signIn(page, s.baseUrl, DEMO_USERS[0].email, DEMO_PASSWORD)
      await page.goto(`${s.baseUrl}/tanks/${tankId}`)
      const month = page.waitForResponse((r: Response) => {
        if (!r.url().includes(`/api/v1/tanks/${tankId}/series?`)) return false
        const query = new URL(r.url()).searchParams
        return query.get('metric') === 'ph' && Date.parse(query.get('from') ?? '') < Date.now() - 29 * DAY_MS
      })
      await page.locator('section[aria-labelledby=readings-title]').getByRole('button', { name: '30 d' }).click({ timeout: 30_000 })
      const series = (await (await month).json()) as SeriesResponse
      // Buckets from thirty days ago to now, every one of them filled.
      expect(Date.parse(series.points[0]!.t)).toBeLessThan(Date.now() - 29.9 * DAY_MS)
      expect(Date.parse(series.points.at(-1)!.t)).toBeGreaterThan(Date.now() - DAY_MS)
      expect(series.points.length).toBeGreaterThanOrEqual((30 * DAY_MS) / (series.bucketSeconds * 1000) - 1)
      await page.waitForTimeout(1500)
      await shot(page, `demo-tank-30d-${name}`)
      await page.goto(`${s.baseUrl}/incidents`)
      await expect.poll(() => page.getByText('Reef display').count(), { timeout: 30_000 }).toBeGreaterThan(0)
      await shot(page, `demo-incidents-${name}`)
      await page.close()
    }
  })
})
