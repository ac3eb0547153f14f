import { randomUUID } from 'node:crypto'
import { rmSync } from 'node:fs'
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { localPhotoStore } from '../../server/photos/storage/local-store'
import { StoredObjectMissing, type PhotoStore } from '../../server/photos/storage/photo-store'
import { s3PhotoStore } from '../../server/photos/storage/s3-store'
import { photoStoreFor } from '../../server/photos/storage'
import type { TestOrg } from '../helpers/app'
import { startFakeS3 } from '../helpers/fake-s3'
import { as, filesUnder, makeImage, newTank, startPhotoTestApp, type PhotoTestApp } from './photos-helpers'

let s3: Awaited<ReturnType<typeof startFakeS3>>
let client: S3Client

beforeAll(async () => {
  s3 = await startFakeS3()
  client = new S3Client({ endpoint: s3.endpoint, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } })
})
afterAll(async () => {
  client?.destroy()
  rmSync(`${s3.directory}-local`, { recursive: true, force: true })
  await s3?.close()
})

async function bucketKeys(): Promise<string[]> {
  const listed = await client.send(new ListObjectsV2Command({ Bucket: s3.bucket }))
  return (listed.Contents ?? []).map((o) => o.Key as string).sort()
}
const readAll = async (stream: NodeJS.ReadableStream) => {
  const chunks: Buffer[] = []
  for await (const chunk of stream) chunks.push(Buffer.from(chunk as Buffer))
  return Buffer.concat(chunks)
}
const key = (variant = 'display') => `7/42/${randomUUID()}-${variant}.jpg`

// The same contract for both stores: put, get as a stream, exists, delete (idempotent), refusal of foreign keys.
describe.each([
  ['s3', () => s3PhotoStore(s3.settings) as PhotoStore],
  ['local', () => localPhotoStore(`${s3.directory}-local`)],
])('the %s photo store', (_kind, make) => {
  it('puts, streams back, reports and deletes an object', async () => {
    const store = make()
    const k = key()
    const body = Buffer.from([0xff, 0xd8, 0xff, 0xe0, ...Array.from({ length: 5000 }, (_, i) => i % 251)])
    expect(await store.exists(k)).toBe(false)
    await store.put(k, body, 'image/jpeg')
    expect(await store.exists(k)).toBe(true)
    expect((await readAll(await store.getStream(k))).equals(body)).toBe(true)
    await store.delete(k)
    expect(await store.exists(k)).toBe(false)
    await expect(store.getStream(k)).rejects.toBeInstanceOf(StoredObjectMissing)
    await expect(store.delete(k)).resolves.toBeUndefined()
  })

  it('refuses keys the server would never generate', async () => {
    const store = make()
    for (const bad of ['../../etc/passwd', '7/42/../../../x.jpg', '/abs/key.jpg', `7/42/${randomUUID()}-display.jpg\u0000`, '']) {
      await expect(store.put(bad, Buffer.from('x'), 'image/jpeg')).rejects.toThrow(/outside the generated shape/)
    }
  })
})

describe('the app with PHOTO_STORE=s3', () => {
  let t: PhotoTestApp
  let org: TestOrg
  beforeAll(async () => {
    t = await startPhotoTestApp({ photos: { maxBytes: 15 * 1024 * 1024, store: { kind: 's3', ...s3.settings } } })
    org = await t.createOrg('Marrowfen Aquatics')
  })
  afterAll(() => t?.close())

  it('uses the S3 store for this configuration', () => {
    expect(photoStoreFor(t.ctx.config).kind).toBe('s3')
  })

  it('stores both images in the bucket, nothing in the data folder, serves them, and deletes them', async () => {
    const tankId = await newTank(t, org)
    const before = await bucketKeys()
    const res = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/photos`)
      .set(as(org, 'keeper'))
      .field('caption', 'Bucket test')
      .attach('photo', await makeImage('webp', 2000, 1000), 'x.webp')
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    const row = (await t.ctx.models.Photo.findByPk(res.body.id))!
    expect((await bucketKeys()).filter((k) => !before.includes(k))).toEqual([row.displayKey, row.thumbnailKey].sort())
    expect(filesUnder(t.photoDir)).toEqual([])

    const image = await t
      .api()
      .get(res.body.display.url)
      .set(as(org, 'viewer'))
      .buffer(true)
      .parse((r, done) => {
        const chunks: Buffer[] = []
        r.on('data', (c: Buffer) => chunks.push(c))
        r.on('end', () => done(null, Buffer.concat(chunks)))
      })
    expect(image.status).toBe(200)
    expect(image.headers['content-type']).toBe('image/jpeg')
    const meta = await sharp(image.body as Buffer).metadata()
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 1600, 800])

    expect((await t.api().delete(`/api/v1/photos/${res.body.id}`).set(as(org, 'owner'))).status).toBe(204)
    expect(await bucketKeys()).toEqual(before)
  })

  it('a refused upload leaves the bucket as it was', async () => {
    const tankId = await newTank(t, org)
    const before = await bucketKeys()
    const res = await t
      .api()
      .post(`/api/v1/tanks/${tankId}/photos`)
      .set(as(org, 'keeper'))
      .attach('photo', Buffer.from('%PDF-1.4 not an image'), { filename: 'x.png', contentType: 'image/png' })
    expect(res.status).toBe(400)
    expect(await bucketKeys()).toEqual(before)
    expect(await t.ctx.models.Photo.count({ where: { tankId } })).toBe(0)
  })
})
