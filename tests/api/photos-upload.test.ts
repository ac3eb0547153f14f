import { existsSync } from 'node:fs'
import { join } from 'node:path'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { TestOrg } from '../helpers/app'
import { as, filesUnder, makeImage, newTank, noisePng, startPhotoTestApp, type PhotoTestApp } from './photos-helpers'

const MAX_BYTES = 400 * 1024
let t: PhotoTestApp
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startPhotoTestApp({ photos: { maxBytes: MAX_BYTES, store: { kind: 'local' } } })
  org = await t.createOrg('Marrowfen Aquatics')
  tankId = await newTank(t, org)
})
afterAll(() => t.close())

const upload = (image: Buffer, options: { filename?: string; contentType?: string; fields?: Record<string, string>; tank?: number } = {}) => {
  let req = t
    .api()
    .post(`/api/v1/tanks/${options.tank ?? tankId}/photos`)
    .set(as(org, 'keeper'))
  for (const [name, value] of Object.entries(options.fields ?? {})) req = req.field(name, value)
  return req.attach('photo', image, { filename: options.filename ?? 'tank.jpg', contentType: options.contentType ?? 'image/jpeg' })
}
const rowCount = () => t.ctx.models.Photo.count()
const fetchBytes = async (url: string) => {
  const res = await t
    .api()
    .get(url)
    .set(as(org, 'viewer'))
    .buffer(true)
    .parse((r, done) => {
      const chunks: Buffer[] = []
      r.on('data', (c: Buffer) => chunks.push(c))
      r.on('end', () => done(null, Buffer.concat(chunks)))
    })
  return res
}

describe('uploading JPEG, PNG and WebP', () => {
  it.each(['jpeg', 'png', 'webp'] as const)('a %s becomes a 1600 px display image and a 320 px thumbnail, both JPEG', async (format) => {
    const image = await makeImage(format, 2400, 1200)
    const res = await upload(image, { filename: `reef.${format}`, contentType: `image/${format}`, fields: { caption: `New rockwork (${format})` } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.caption).toBe(`New rockwork (${format})`)
    expect(res.body.uploadedBy).toEqual({ id: org.users.keeper.id, name: 'keeper of Marrowfen Aquatics' })
    expect(res.body.display).toMatchObject({ width: 1600, height: 800 })
    expect(res.body.thumbnail).toMatchObject({ width: 320, height: 160 })

    const row = await t.ctx.models.Photo.findByPk(res.body.id)
    expect(row!.originalFormat).toBe(format)
    for (const [key, width, height] of [
      [row!.displayKey, 1600, 800],
      [row!.thumbnailKey, 320, 160],
    ] as const) {
      expect(key).toMatch(new RegExp(`^${org.organizationId}/${tankId}/[0-9a-f-]{36}-(display|thumb)\\.jpg$`))
      const meta = await sharp(join(t.photoDir, key)).metadata()
      expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', width, height])
    }
    const thumb = await fetchBytes(res.body.thumbnail.url)
    expect(thumb.status).toBe(200)
    expect(thumb.headers['content-type']).toBe('image/jpeg')
    expect((await sharp(thumb.body as Buffer).metadata()).width).toBe(320)
  })

  it('a small image is not enlarged', async () => {
    const res = await upload(await makeImage('png', 200, 150), { contentType: 'image/png' })
    expect(res.status).toBe(201)
    expect(res.body.display).toMatchObject({ width: 200, height: 150 })
    expect(res.body.thumbnail).toMatchObject({ width: 200, height: 150 })
  })

  it('EXIF, GPS included, is stripped, and the orientation tag is applied to the pixels first', async () => {
    // 600 × 300 stored, tagged "rotate 90° clockwise to view" (EXIF orientation 6): it is seen as 300 × 600.
    const tagged = await sharp(await makeImage('jpeg', 600, 300))
      .withExif({
        IFD0: { Make: 'Probe Camera', Copyright: 'Marrowfen Aquatics' },
        IFD3: { GPSLatitudeRef: 'N', GPSLatitude: '51/1 30/1 0/1', GPSLongitudeRef: 'W', GPSLongitude: '0/1 7/1 0/1' },
      })
      .withMetadata({ orientation: 6 })
      .jpeg()
      .toBuffer()
    const before = await sharp(tagged).metadata()
    expect(before.exif?.includes(Buffer.from('Probe Camera'))).toBe(true)
    expect(before.orientation).toBe(6)

    const res = await upload(tagged)
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.display).toMatchObject({ width: 300, height: 600 })
    const served = await fetchBytes(res.body.display.url)
    const after = await sharp(served.body as Buffer).metadata()
    expect(after.exif).toBeUndefined()
    expect(after.orientation).toBeUndefined()
    expect((served.body as Buffer).includes(Buffer.from('Probe Camera'))).toBe(false)
    expect((served.body as Buffer).includes(Buffer.from('Marrowfen Aquatics'))).toBe(false)
    expect([after.width, after.height]).toEqual([300, 600])
  })

  it('the type is read from the content: a PNG sent as image/gif named .gif is accepted as a PNG', async () => {
    const res = await upload(await makeImage('png', 400, 400), { filename: 'odd.gif', contentType: 'image/gif' })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect((await t.ctx.models.Photo.findByPk(res.body.id))!.originalFormat).toBe('png')
  })

  it('caption, taken-at and a linked care-log entry are kept', async () => {
    const entry = await t.api().post(`/api/v1/tanks/${tankId}/care-log`).set(as(org, 'keeper')).send({ kind: 'note', text: 'Trimmed the stem plants' })
    expect(entry.status).toBe(201)
    const takenAt = '2026-11-20T09:30:00.000Z'
    const res = await upload(await makeImage('webp', 800, 600), { fields: { caption: 'After the trim', takenAt, careLogEntryId: String(entry.body.id) } })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body).toMatchObject({ caption: 'After the trim', takenAt, careLogEntryId: entry.body.id })
    const list = await t.api().get(`/api/v1/tanks/${tankId}/photos?from=2026-11-20T00:00:00Z&to=2026-11-21T00:00:00Z`).set(as(org, 'viewer'))
    expect(list.status).toBe(200)
    expect(list.body.map((p: { id: number }) => p.id)).toEqual([res.body.id])
  })
})

describe('refused uploads store nothing', () => {
  async function expectRefused(
    send: () => Promise<{ status: number; body: { error?: { code: string; message: string; fields?: Record<string, string> } } }>,
    status: number,
    field: string,
    message: RegExp,
  ) {
    const rows = await rowCount()
    const files = filesUnder(t.photoDir)
    const res = await send()
    expect(res.status, JSON.stringify(res.body)).toBe(status)
    expect(Object.keys(res.body.error?.fields ?? {})).toContain(field)
    expect(res.body.error!.message).toMatch(message)
    expect(await rowCount()).toBe(rows)
    expect(filesUnder(t.photoDir)).toEqual(files)
  }

  it('a text file renamed .jpg and sent as image/jpeg is refused', async () => {
    await expectRefused(
      () => upload(Buffer.from('just some notes about the tank\n'.repeat(20)), { filename: 'notes.jpg' }),
      400,
      'photo',
      /not a readable image/,
    )
  })
  it('a real GIF and a real TIFF are refused by content, whatever they are called', async () => {
    await expectRefused(
      async () => upload(await makeImage('gif', 64, 64), { filename: 'fish.png', contentType: 'image/png' }),
      400,
      'photo',
      /gif images are not accepted/,
    )
    await expectRefused(
      async () => upload(await makeImage('tiff', 64, 64), { filename: 'fish.webp', contentType: 'image/webp' }),
      400,
      'photo',
      /tiff images are not accepted/,
    )
  })
  it('a truncated JPEG is refused as damaged', async () => {
    const whole = await makeImage('jpeg', 800, 800)
    await expectRefused(() => upload(whole.subarray(0, Math.floor(whole.length / 2))), 400, 'photo', /damaged|not a readable/)
  })
  it('a file over PHOTO_MAX_MB answers 413 naming the limit', async () => {
    const big = await noisePng(400, 400)
    expect(big.length).toBeGreaterThan(MAX_BYTES)
    await expectRefused(() => upload(big, { contentType: 'image/png' }), 413, 'photo', /larger than the 0\.4 MB limit/)
  })
  it('no file, or the file under another field name, is a 400 naming photo', async () => {
    await expectRefused(
      () => t.api().post(`/api/v1/tanks/${tankId}/photos`).set(as(org, 'keeper')).field('caption', 'nothing attached'),
      400,
      'photo',
      /attach a JPEG, PNG or WebP/,
    )
    await expectRefused(
      async () =>
        t
          .api()
          .post(`/api/v1/tanks/${tankId}/photos`)
          .set(as(org, 'keeper'))
          .attach('file', await makeImage('jpeg', 50, 50), 'a.jpg'),
      400,
      'photo',
      /field named "photo"/,
    )
  })
  it('bad fields are 400s naming them', async () => {
    const image = await makeImage('jpeg', 100, 100)
    await expectRefused(() => upload(image, { fields: { takenAt: 'last tuesday' } }), 400, 'takenAt', /takenAt/)
    await expectRefused(() => upload(image, { fields: { takenAt: new Date(Date.now() + 86_400_000).toISOString() } }), 400, 'takenAt', /future/)
    await expectRefused(() => upload(image, { fields: { caption: 'x'.repeat(501) } }), 400, 'caption', /caption/)
    await expectRefused(() => upload(image, { fields: { caption: 'nul \u0000 inside' } }), 400, 'caption', /NUL/)
    await expectRefused(() => upload(image, { fields: { careLogEntryId: '999999' } }), 400, 'careLogEntryId', /no such care-log entry/)
  })
  it('a care-log entry of another tank cannot be linked', async () => {
    const otherTank = await newTank(t, org)
    const entry = await t.api().post(`/api/v1/tanks/${otherTank}/care-log`).set(as(org, 'keeper')).send({ kind: 'note', text: 'Other tank' })
    await expectRefused(
      async () => upload(await makeImage('jpeg', 100, 100), { fields: { careLogEntryId: String(entry.body.id) } }),
      400,
      'careLogEntryId',
      /no such care-log entry/,
    )
  })
})

describe('crafted file names are harmless', () => {
  it.each([
    ['a path climbing out', '../../etc/passwd'],
    ['an absolute path', '/etc/shadow.jpg'],
    ['a Windows path', '..\\..\\windows\\system32\\x.jpg'],
    ['a very long name', `${'a'.repeat(5000)}.jpg`],
    ['quotes and new lines', 'a"b\r\nContent-Type: text/html.jpg'],
  ])('%s: stored under a generated key inside the photo folder', async (_what, filename) => {
    const before = filesUnder(t.photoDir)
    const res = await upload(await makeImage('jpeg', 120, 90), { filename })
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const row = (await t.ctx.models.Photo.findByPk(res.body.id))!
    const added = filesUnder(t.photoDir).filter((f) => !before.includes(f))
    expect(added.sort()).toEqual([row.displayKey, row.thumbnailKey].sort())
    for (const key of added) expect(key).toMatch(/^\d+\/\d+\/[0-9a-f-]{36}-(display|thumb)\.jpg$/)
    expect(JSON.stringify(res.body)).not.toContain('passwd')
    expect(existsSync(join(t.dataDir, 'etc'))).toBe(false)
    expect(existsSync(join(t.photoDir, '..', '..', 'etc', 'passwd'))).toBe(false)
    const served = await t.api().get(res.body.display.url).set(as(org, 'owner'))
    expect(served.headers['content-disposition']).toBe(`inline; filename="photo-${row.id}.jpg"`)
  })

  it('a NUL byte in the part header is a malformed form: a 400, and nothing stored', async () => {
    const [rows, files] = [await rowCount(), filesUnder(t.photoDir)]
    const res = await upload(await makeImage('jpeg', 120, 90), { filename: 'tank.jpg\u0000.sh' })
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.error).toMatchObject({ code: 'invalid_input', fields: { body: 'unreadable multipart form' } })
    expect([await rowCount(), filesUnder(t.photoDir)]).toEqual([rows, files])
  })
})
