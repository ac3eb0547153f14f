import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DECODES_AT_ONCE, decodeStats } from '../../server/photos/photo-images'
import type { TestOrg } from '../helpers/app'
import { as, filesUnder, makeImage, newTank, startPhotoTestApp, type PhotoTestApp } from './photos-helpers'

// What decoding an upload may cost. Type sniffing, metadata stripping and the byte limit are in
// tests/api/photos-upload.test.ts.

let t: PhotoTestApp
let org: TestOrg
let tankId: number

beforeAll(async () => {
  t = await startPhotoTestApp({ photos: { maxBytes: 20 * 1024 * 1024, store: { kind: 'local' } } })
  org = await t.createOrg('Marrowfen Decode Limits')
  tankId = await newTank(t, org)
})
afterAll(() => t.close())

const upload = (image: Buffer, contentType: string) =>
  t.api().post(`/api/v1/tanks/${tankId}/photos`).set(as(org, 'keeper')).attach('photo', image, { filename: 'tank', contentType })

describe('photo decoding', () => {
  it('refuses a 79-megapixel PNG of about a megabyte with a 413 naming the limit, storing nothing', async () => {
    const bomb = await sharp({ create: { width: 8900, height: 8900, channels: 3, background: '#2a6f5b' } })
      .png({ compressionLevel: 9 })
      .toBuffer()
    expect(bomb.length).toBeLessThan(2 * 1024 * 1024)
    const res = await upload(bomb, 'image/png')
    expect(res.status).toBe(413)
    expect(res.body.error).toMatchObject({
      code: 'too_large',
      message: 'photo: 79 megapixels is more than the 50 accepted',
      fields: { photo: 'at most 50 megapixels' },
    })
    expect(await t.ctx.models.Photo.count()).toBe(0)
    expect(filesUnder(t.photoDir)).toEqual([])
  })

  it(`decodes at most ${DECODES_AT_ONCE} uploads at once, and takes them all`, async () => {
    const image = await makeImage('jpeg', 4000, 3000)
    const answers = await Promise.all(Array.from({ length: 6 }, () => upload(image, 'image/jpeg')))
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201, 201, 201, 201])
    expect(decodeStats().peak).toBe(DECODES_AT_ONCE)
    expect(decodeStats()).toMatchObject({ active: 0, waiting: 0 })
  })
})
