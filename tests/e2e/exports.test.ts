import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import bcrypt from 'bcryptjs'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { createTankWithDevice, TEST_PASSWORD, type TestOrg } from '../helpers/fixtures'
import { launchBrowser, shot, signIn, startAppForBrowser } from './browser'
import { FIRST_LOAD_MS, type App } from './keeper-setup'

let s: App
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
let deviceId: number
const downloads = mkdtempSync(join(tmpdir(), 'tw-backup-'))

beforeAll(async () => {
  s = await startAppForBrowser()
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Backup Org')
  ;({ tankId, deviceId } = await createTankWithDevice(s.ctx, org, 'Plant tank'))
  const twoDaysAgo = new Date(Math.floor((Date.now() - 2 * 86_400_000) / 60_000) * 60_000)
  await s.ctx.sequelize.query("INSERT INTO readings (source_key, metric, time, tank_id, value, source) VALUES ($1, 'temperature', $2, $3, 25.25, 'device')", {
    bind: [`d:${deviceId}`, twoDaysAgo.toISOString(), tankId],
  })
})
afterAll(async () => {
  rmSync(downloads, { recursive: true, force: true })
  await b?.close()
  await s?.close()
})

describe('downloads and restore in the browser', () => {
  it('a viewer downloads the readings of a tank as CSV from the tank page', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 }, acceptDownloads: true })
    await signIn(page, s.baseUrl, org.users.viewer.email)
    await page.goto(`${s.baseUrl}/tanks/${tankId}`)
    await page.getByRole('button', { name: 'Download CSV' }).click({ timeout: FIRST_LOAD_MS })
    await page.getByRole('button', { name: 'Last 7 days' }).or(page.getByText('Last 7 days')).first().click()
    const [download] = await Promise.all([page.waitForEvent('download'), page.locator('[data-test="export-download"]').click()])
    expect(download.suggestedFilename()).toMatch(/^tankwarden-readings-plant-tank-\d{4}-\d{2}-\d{2}-to-\d{4}-\d{2}-\d{2}\.csv$/)
    const lines = readFileSync((await download.path())!, 'utf8')
      .trimEnd()
      .split('\r\n')
    expect(lines[0]).toBe('time,tank,metric,value,unit,source')
    expect(lines).toHaveLength(2)
    // The fixture's site is in Europe/Berlin: +01:00 in winter, +02:00 in summer.
    expect(lines[1]).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:00\+0[12]:00,Plant tank,temperature,25.25,C,Plant tank node$/)
    await shot(page, 'export-tank-csv')
    await page.close()
  })

  it('an owner downloads a backup, and the owner of a new empty organization restores it', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 }, acceptDownloads: true })
    await signIn(page, s.baseUrl, org.users.owner.email)
    await page.goto(`${s.baseUrl}/backup`)
    const [download] = await Promise.all([
      page.waitForEvent('download', { timeout: FIRST_LOAD_MS }),
      page.locator('[data-test="backup-download"]').click({ timeout: FIRST_LOAD_MS }),
    ])
    // The browser's copy goes with the page; keep our own for the restore.
    const path = join(downloads, download.suggestedFilename())
    await download.saveAs(path)
    const backup = JSON.parse(readFileSync(path, 'utf8'))
    expect(backup.formatVersion).toBe(3)
    expect(backup.tables.tanks.map((tank: { name: string }) => tank.name)).toEqual(['Plant tank'])
    await page.close()

    // The old organization is gone; its people's addresses are free again.
    await s.ctx.models.Organization.destroy({ where: { id: org.organizationId } })
    const fresh = await s.ctx.models.Organization.create({ name: 'Empty org' })
    const email = `restorer-${process.pid}@backup-org.example`
    await s.ctx.models.User.create({
      organizationId: fresh.id,
      email,
      name: 'Restoring owner',
      role: 'owner',
      passwordHash: await bcrypt.hash(TEST_PASSWORD, 4),
    })

    const restorer = await browser.newPage({ viewport: { width: 1440, height: 1000 } })
    await signIn(restorer, s.baseUrl, email)
    await restorer.goto(`${s.baseUrl}/backup`)
    await restorer.locator('[data-test="backup-file"] input[type="file"]').setInputFiles(path, { timeout: FIRST_LOAD_MS })
    await restorer.locator('[data-test="backup-restore"]').click()
    await restorer.locator('[data-test="backup-restore-confirm"]').click()
    const restored = restorer.locator('[data-test="backup-restored"]')
    await restored.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await restored.textContent()).toContain('Restored Backup Org: 2 sites, 1 tank, 1 reading.')
    expect(await restored.textContent()).toContain('new token')
    expect(await s.ctx.models.Tank.count({ where: { organizationId: fresh.id, name: 'Plant tank' } })).toBe(1)
    await shot(restorer, 'backup-restored')

    // A second restore into the now busy organization is refused, in words.
    await restorer.locator('[data-test="backup-restore"]').click()
    await restorer.locator('[data-test="backup-restore-confirm"]').click()
    const refused = restorer.locator('[data-test="backup-restore-error"]')
    await refused.waitFor({ timeout: FIRST_LOAD_MS })
    expect(await refused.textContent()).toContain('only be restored into an empty organization')
    await restorer.close()
  })
})
