import type { Browser, Locator, Page, Response } from 'playwright-core'
import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'
import { createTankWithDevice, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
let stored = 0

const DAY_MINUTES = 1440

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Tank Page Org')
  const tank = await createTankWithDevice(s.ctx, org, 'Planted display')
  tankId = tank.tankId
  // Two days of one-minute readings: a daily swing of ±0.5 °C around 25 °C that ends on exactly 25.0 °C now.
  await s.ctx.sequelize.query(
    `INSERT INTO readings (source_key, metric, time, tank_id, value, source)
     SELECT 'd:' || $2, 'temperature', date_trunc('minute', now()) - m * interval '1 minute', $1,
            round((25 + 0.5 * sin(2 * pi() * m / ${DAY_MINUTES}))::numeric, 2), 'device'
       FROM generate_series(0, ${2 * DAY_MINUTES - 1}) AS m`,
    { bind: [tankId, tank.deviceId] },
  )
  const [row] = await s.ctx.sequelize.query<{ n: number }>('SELECT count(*)::int AS n FROM readings WHERE tank_id = $1', {
    bind: [tankId],
    type: QueryTypes.SELECT,
  })
  stored = row!.n
  expect(stored).toBe(2 * DAY_MINUTES)
})
afterAll(async () => {
  await b?.close()
  await s?.close()
})

const seriesOf = (page: Page, metric: string) =>
  page.waitForResponse((r: Response) => r.url().includes(`/api/v1/tanks/${tankId}/series?`) && new URL(r.url()).searchParams.get('metric') === metric)

async function subtitleOf(page: Page, metric: string) {
  return (await page.locator(`[data-test=metric-panel-${metric}] .v-card-subtitle`).textContent())?.trim()
}

/** Segments in the longest SVG path of a chart: the drawn series line, not an axis or grid line. */
const longestLine = (chart: Locator) =>
  chart.locator('svg path').evaluateAll((paths) => Math.max(0, ...paths.map((p) => (p.getAttribute('d') ?? '').match(/[LC]/g)?.length ?? 0)))

function expectedSubtitle(bucketSeconds: number) {
  if (bucketSeconds === 0) return 'every reading'
  const minutes = bucketSeconds / 60
  return minutes < 120 ? `mean and min–max per ${minutes} min` : `mean and min–max per ${minutes / 60} h`
}

describe('the tank page and the test kit, for a keeper', () => {
  it('charts the temperature, raw for 6 hours and in buckets for 7 days', async () => {
    const page = await browser.newPage({ viewport: { width: 1600, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    const first = seriesOf(page, 'temperature')
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    const day = (await (await first).json()) as SeriesResponse
    // 1,440 readings in 24 h are more than the 600 points a chart asks for.
    expect(day.bucketSeconds).toBeGreaterThan(0)
    const chart = page.locator('[data-test=metric-panel-temperature] [role=img][aria-label="Temperature chart"]')
    await expect.poll(() => longestLine(chart), { timeout: FIRST_LOAD_MS }).toBeGreaterThan(50)
    expect(await subtitleOf(page, 'temperature')).toBe(expectedSubtitle(day.bucketSeconds))

    const readings = page.locator('section[aria-labelledby=readings-title]')
    const sixHours = seriesOf(page, 'temperature')
    await readings.getByRole('button', { name: '6 h' }).click()
    const six = (await (await sixHours).json()) as SeriesResponse
    expect(six.bucketSeconds).toBe(0)
    expect(six.raw.length).toBeGreaterThanOrEqual(359)
    expect(six.raw.length).toBeLessThanOrEqual(361)
    expect(six.raw.at(-1)).toMatchObject({ value: 25, source: 'device' })
    await expect.poll(() => subtitleOf(page, 'temperature')).toBe('every reading')

    const sevenDays = seriesOf(page, 'temperature')
    await readings.getByRole('button', { name: '7 d' }).click()
    const week = (await (await sevenDays).json()) as SeriesResponse
    expect(week.bucketSeconds).toBeGreaterThan(0)
    expect(week.raw).toEqual([])
    // Every stored reading falls in some bucket, and no bucket mean leaves the ±0.5 °C swing.
    expect(week.points.reduce((sum, p) => sum + p.count, 0)).toBe(stored)
    for (const p of week.points) expect(Math.abs(p.mean - 25)).toBeLessThanOrEqual(0.5)
    // Readings span 2 days less a minute, so they touch that span over the step buckets, or one more.
    const span = (2 * DAY_MINUTES - 1) * 60
    expect(week.points.length).toBeGreaterThanOrEqual(Math.ceil(span / week.bucketSeconds))
    expect(week.points.length).toBeLessThanOrEqual(Math.ceil(span / week.bucketSeconds) + 1)
    await expect.poll(() => subtitleOf(page, 'temperature')).toBe(expectedSubtitle(week.bucketSeconds))
    await expect.poll(() => longestLine(chart)).toBeGreaterThan(50)
    expect((await page.locator('[data-test=current-values]').innerText()).replace(/\s+/g, ' ')).toContain('Temperature 25.0 °C')
    await shot(page, 'tank-page-7d')
    await page.close()
  })

  it('saves a test-kit entry, lists it, explains it, and shows it on the tank page', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 1000 } })
    await signIn(page, s.baseUrl, org.users.keeper.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.getByRole('link', { name: 'Log test' }).click({ timeout: FIRST_LOAD_MS })
    await page.waitForURL((url) => url.pathname === `/tanks/${tankId}/test-kit`)
    const form = page.locator('form.tw-kit-form')
    await form.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await page.getByText('What the numbers mean').count()).toBe(0)

    await form.getByLabel('pH', { exact: true }).fill('7.1')
    await form.getByLabel('Ammonia', { exact: true }).fill('0.25')
    const saved = page.waitForResponse((r) => r.url().endsWith(`/api/v1/tanks/${tankId}/test-kit-entries`) && r.request().method() === 'POST')
    await form.getByRole('button', { name: 'Save test-kit entry' }).click()
    const answer = await saved
    expect(answer.status()).toBe(201)
    const entry = (await answer.json()) as { id: number; values: Array<{ metric: string; value: number; unit: string }> }
    expect(entry.values.map((v) => [v.metric, v.value, v.unit]).sort()).toEqual([
      ['ammonia', 0.25, 'mg/L'],
      ['ph', 7.1, 'pH'],
    ])

    await page.locator('[data-test=kit-saved]').waitFor()
    const insights = page.locator('[data-test=kit-insights]')
    expect((await insights.locator('.v-card-title').textContent())?.trim()).toBe('What the numbers mean')
    // Emerson, Russo, Lund & Thurston 1975 (J. Fish. Res. Board Can. 32:2379–2383): pKa = 0.09018 + 2729.92 / T,
    // T in kelvin (from memory). At pH 7.1 and 25.0 °C (the tank's latest reading) that is 0.71 % NH3.
    const pKa = 0.09018 + 2729.92 / (273.2 + 25)
    const percent = 100 / (1 + 10 ** (pKa - 7.1))
    const ammonia = (await insights.locator('[data-test=insight-ammonia]').textContent())?.replace(/\s+/g, ' ') ?? ''
    expect(ammonia).toContain(`${percent.toFixed(2)} % of the total ammonia`)
    expect(ammonia).toContain(`${((0.25 * percent) / 100).toFixed(3)} mg/L NH₃`)
    expect(ammonia).toContain('from 0.25 mg/L, pH 7.10, 25.0 °C (latest reading)')

    const history = page.locator(`[data-test=kit-entry-${entry.id}]`)
    await history.waitFor()
    const listed = (await history.textContent())?.replace(/\s+/g, ' ') ?? ''
    expect(listed).toContain('keeper of Tank Page Org')
    expect(listed).toMatch(/pH 7\.1 · Ammonia 0\.25 mg\/L|Ammonia 0\.25 mg\/L · pH 7\.1/)
    await insights.scrollIntoViewIfNeeded()
    await shot(page, 'test-kit-saved')

    // Back on the tank page: the kit values are the newest pH and ammonia, and on the charts.
    const kitList = page.waitForResponse((r) => r.url().includes(`/api/v1/tanks/${tankId}/test-kit-entries?`) && r.request().method() === 'GET')
    const phSeries = seriesOf(page, 'ph')
    await page.getByRole('link', { name: 'Back to the tank' }).click()
    const entries = (await (await kitList).json()) as Array<{ id: number }>
    expect(entries.map((e) => e.id)).toContain(entry.id)
    const ph = (await (await phSeries).json()) as SeriesResponse
    expect(ph.raw.map((r) => [r.value, r.source])).toEqual([[7.1, 'test_kit']])
    const current = page.locator('[data-test=current-values]')
    await expect.poll(async () => (await current.innerText()).replace(/\s+/g, ' ')).toMatch(/pH pH 7\.10 .*test kit/)
    expect((await current.innerText()).replace(/\s+/g, ' ')).toMatch(/Ammonia 0\.25 mg\/L .*test kit/)
    await page.locator('[data-test=metric-panel-ph] [role=img] svg').waitFor()
    await shot(page, 'tank-page-after-kit')
    await page.close()
  })
})
