import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Browser, Page } from 'playwright-core'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, sampleTank } from '../helpers/app'
import type { TestOrg } from '../helpers/fixtures'
import { startTestServer } from '../helpers/server'
import { launchBrowser, shot, signIn } from './browser'
import { FIRST_LOAD_MS } from './keeper-setup'

let s: Awaited<ReturnType<typeof startTestServer>>
let b: Awaited<ReturnType<typeof launchBrowser>>
let browser: Browser
let org: TestOrg
let tankId: number
let dataDir: string
const outside: string[] = []
/** The few fields of an <img> read in the page; the server's type check has no DOM library. */
type ImageFields = { complete: boolean; naturalWidth: number; src: string }
// Uploads are re-encoded on a busy two-core machine: waits are generous, the asserted values exact.
const WAIT = { timeout: 30_000 }

/** A JPEG with a coloured band, big enough that the display size is a real downscale. */
const picture = (width: number, height: number, rgb: [number, number, number]) =>
  sharp({ create: { width, height, channels: 3, background: { r: rgb[0], g: rgb[1], b: rgb[2] } } })
    .jpeg()
    .toBuffer()

async function uploadThroughApi(token: string, image: Buffer, fields: Record<string, string>) {
  const form = new FormData()
  for (const [name, value] of Object.entries(fields)) form.append(name, value)
  form.append('photo', new Blob([image]), 'seed.jpg')
  const res = await fetch(`${s.baseUrl}/api/v1/tanks/${tankId}/photos`, { method: 'POST', body: form, headers: bearer(token) })
  expect(res.status).toBe(201)
  return (await res.json()) as { id: number }
}
const rows = () => s.ctx.models.Photo.findAll({ where: { tankId }, order: [['id', 'ASC']] })

async function openPage(role: 'keeper' | 'viewer'): Promise<Page> {
  const page = await browser.newPage()
  page.on('request', (request) => {
    const url = request.url()
    if (!url.startsWith(s.baseUrl) && !url.startsWith('blob:') && !url.startsWith('data:')) outside.push(url)
  })
  await signIn(page, s.baseUrl, org.users[role].email)
  await page.goto(`${s.baseUrl}/tanks/${tankId}`)
  await page.locator('[data-test=photo-timeline]').waitFor({ timeout: FIRST_LOAD_MS })
  return page
}

/** The image shown in a tile has really decoded, from a blob: URL the app made (not a URL carrying a token). */
async function decodedImage(page: Page, selector: string) {
  const img = page.locator(`${selector} [data-test=photo-img]`).first()
  await img.waitFor()
  await expect.poll(() => img.evaluate((el) => (el as unknown as ImageFields).complete && (el as unknown as ImageFields).naturalWidth), WAIT).toBeGreaterThan(0)
  return img.evaluate((el) => ({ src: (el as unknown as ImageFields).src, width: (el as unknown as ImageFields).naturalWidth }))
}

beforeAll(async () => {
  dataDir = mkdtempSync(join(tmpdir(), 'tankwarden-e2e-photos-'))
  s = await startTestServer({ serveClient: true, signInLimit: 10_000, dataDir, mail: { fakeSmtpPort: 0, from: 'e2e@tankwarden.invalid' } })
  b = await launchBrowser()
  browser = b.browser
  org = await s.createOrg('Marrowfen Aquatics')
  const tank = await fetch(`${s.baseUrl}/api/v1/tanks`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...bearer(org.users.owner.token) },
    body: JSON.stringify(sampleTank(org.siteIds[0] as number, { name: 'Shallows display' })),
  })
  expect(tank.status).toBe(201)
  tankId = ((await tank.json()) as { id: number }).id
  await uploadThroughApi(org.users.owner.token, await picture(1200, 900, [30, 120, 90]), {
    caption: 'Before the trim',
    takenAt: new Date(Date.now() - 3 * 86_400_000).toISOString(),
  })
})
afterAll(async () => {
  await b?.close()
  await s?.close()
  if (dataDir) rmSync(dataDir, { recursive: true, force: true })
})

describe('the photo timeline on the tank page', () => {
  it('shows a keeper the thumbnails by day, opens one large, and takes uploads from the page, the care log and a task done', { timeout: 240_000 }, async () => {
    const page = await openPage('keeper')
    const [seeded] = await rows()
    const tile = `[data-test=photo-${seeded!.id}]`
    const thumb = await decodedImage(page, tile)
    expect(thumb.src.startsWith('blob:')).toBe(true)
    expect(thumb.width).toBe(320)
    await expect.poll(() => page.locator(`${tile}`).textContent(), WAIT).toContain('Before the trim')

    // Open large: the display size, the caption.
    await page.locator(tile).click()
    const viewer = page.locator('[data-test=photo-viewer]')
    await viewer.waitFor()
    expect((await decodedImage(page, '[data-test=photo-viewer]')).width).toBe(1200)
    expect(await viewer.locator('[data-test=photo-viewer-caption]').textContent()).toBe('Before the trim')
    await page.locator('[data-test=photo-viewer-close]').click()
    await viewer.waitFor({ state: 'detached' })

    // Upload from the timeline.
    await page.locator('[data-test=photo-add]').click()
    await page
      .locator('.v-dialog [data-test=photo-input]')
      .setInputFiles({ name: 'whatever.png', mimeType: 'image/png', buffer: await picture(2000, 1000, [200, 80, 40]) })
    await page.locator('.v-dialog [data-test=photo-caption] input').fill('New driftwood')
    await page.locator('[data-test=photo-upload-save]').click()
    await expect.poll(async () => (await rows()).length, WAIT).toBe(2)
    const uploaded = (await rows())[1]!
    expect(uploaded).toMatchObject({ caption: 'New driftwood', careLogEntryId: null, displayWidth: 1600, displayHeight: 800, uploadedBy: org.users.keeper.id })
    expect((await decodedImage(page, `[data-test=photo-${uploaded.id}]`)).width).toBe(320)

    // A care-log entry with a photo: linked, and the viewer names the entry.
    await page.locator('[data-test=care-log-add]').click()
    await page.locator('.v-dialog textarea[name=text]').fill('Cleaned the front glass')
    await page
      .locator('.v-dialog [data-test=photo-input]')
      .setInputFiles({ name: 'glass.jpg', mimeType: 'image/jpeg', buffer: await picture(800, 600, [10, 40, 160]) })
    await page.locator('[data-test=log-save]').click()
    await expect.poll(async () => (await rows()).length, WAIT).toBe(3)
    const logged = (await rows())[2]!
    const entry = await s.ctx.models.CareLogEntry.findByPk(logged.careLogEntryId!)
    expect(entry).toMatchObject({ tankId, kind: 'note', text: 'Cleaned the front glass' })
    await page.locator(`[data-test=photo-${logged.id}]`).click()
    await expect.poll(() => page.locator('[data-test=photo-viewer-care-log]').textContent(), WAIT).toContain('Cleaned the front glass')
    await shot(page, 'photos-viewer')
    await page.locator('[data-test=photo-viewer-close]').click()
    await page.locator('[data-test=photo-viewer]').waitFor({ state: 'detached' })

    // Marking a care task done, with a photo.
    await page.locator('[data-test=care-task-done-notes]').first().click()
    await page.locator('.v-dialog [data-test=photo-input]').setInputFiles({
      name: 'done.webp',
      mimeType: 'image/webp',
      buffer: await sharp(await picture(640, 480, [90, 90, 20]))
        .webp()
        .toBuffer(),
    })
    await page.locator('[data-test=done-save]').click()
    await expect.poll(async () => (await rows()).length, WAIT).toBe(4)
    const done = (await rows())[3]!
    const doneEntry = await s.ctx.models.CareLogEntry.findByPk(done.careLogEntryId!)
    expect(doneEntry).toMatchObject({ tankId, kind: 'task_done' })
    expect(done.originalFormat).toBe('webp')
    await decodedImage(page, `[data-test=photo-${done.id}]`)
    await shot(page, 'photos-timeline')

    // Delete from the viewer.
    await page.locator(`[data-test=photo-${uploaded.id}]`).click()
    await page.locator('[data-test=photo-delete]').click()
    await expect.poll(async () => (await rows()).map((r) => r.id), WAIT).not.toContain(uploaded.id)
    await page.locator(`[data-test=photo-${uploaded.id}]`).waitFor({ state: 'detached' })
    await page.close()
  })

  it('shows a viewer the photos without the upload and delete controls', { timeout: 120_000 }, async () => {
    const page = await openPage('viewer')
    const [seeded] = await rows()
    await decodedImage(page, `[data-test=photo-${seeded!.id}]`)
    expect(await page.locator('[data-test=photo-add]').count()).toBe(0)
    await page.locator(`[data-test=photo-${seeded!.id}]`).click()
    await page.locator('[data-test=photo-viewer]').waitFor()
    expect(await page.locator('[data-test=photo-delete]').count()).toBe(0)
    await page.close()
  })

  it('loaded nothing from outside the app', () => {
    expect(outside).toEqual([])
  })
})
