import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { listTankPhotos, photosInPeriod, readPhotoBytes } from '../../server/photos/photos'
import { wallService } from '../../server/sites/wall'
import type { UserActor } from '../../server/access/actor'
import { bearer, type TestOrg } from '../helpers/app'
import { as, filesUnder, makeImage, newTank, startPhotoTestApp, type PhotoTestApp } from './photos-helpers'
import { readable, requestAs, roleCases, tokenOf, writers, type RoleRow } from '../helpers/role-table'

// Photos follow the readings' scope rules: every role of the organization reads, owners and keepers
// upload and delete, a viewer limited to one site sees nothing of another, another organization gets 404.
let t: PhotoTestApp
let org: TestOrg
let other: TestOrg
let image: Buffer

beforeAll(async () => {
  t = await startPhotoTestApp()
  org = await t.createOrg('Marrowfen Aquatics')
  other = await t.createOrg('Quillby Fish Room')
  image = await makeImage('jpeg', 640, 480)
})
afterAll(() => t.close())

async function freshPhoto(siteId = org.siteIds[0] as number, takenAt?: string) {
  const tankId = await newTank(t, org, siteId)
  let req = t.api().post(`/api/v1/tanks/${tankId}/photos`).set(as(org, 'keeper')).field('caption', 'Probe')
  if (takenAt) req = req.field('takenAt', takenAt)
  const res = await req.attach('photo', image, 'probe.jpg')
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return { tankId, photoId: res.body.id as number }
}

const ROWS: RoleRow<{ path: string; attach?: boolean }>[] = [
  ['get', '/tanks/:id/photos', readable, async () => ({ path: `/tanks/${(await freshPhoto()).tankId}/photos` })],
  ['post', '/tanks/:id/photos', writers(201), async () => ({ path: `/tanks/${await newTank(t, org)}/photos`, attach: true })],
  ['get', '/photos/:id', readable, async () => ({ path: `/photos/${(await freshPhoto()).photoId}` })],
  ['get', '/photos/:id/image', readable, async () => ({ path: `/photos/${(await freshPhoto()).photoId}/image` })],
  ['get', '/photos/:id/thumbnail', readable, async () => ({ path: `/photos/${(await freshPhoto()).photoId}/thumbnail` })],
  ['delete', '/photos/:id', writers(204), async () => ({ path: `/photos/${(await freshPhoto()).photoId}` })],
]

describe('photo route roles', () => {
  it.each(roleCases(ROWS))('$method $route as $caller → $status', async ({ method, caller, status, prepare }) => {
    const { path, attach } = await prepare()
    const req = requestAs(t, method, path, tokenOf(caller, org, other))
    const res = await (attach ? req.attach('photo', image, 'probe.jpg') : req)
    expect(res.status, JSON.stringify(res.body)).toBe(status)
  })
})

describe('a wall display key', () => {
  it("opens no photo route, not even of its own site's tank", async () => {
    const owner: UserActor = { kind: 'user', userId: org.users.owner.id, organizationId: org.organizationId, role: 'owner', siteIds: null, sessionId: 'probe' }
    const { link } = await wallService(t.ctx).createCredential(owner, org.siteIds[0] as number, 'Photo probe wall')
    const key = new URL(link, 'http://localhost').searchParams.get('key')!
    const { tankId, photoId } = await freshPhoto(org.siteIds[0])
    for (const path of [`/tanks/${tankId}/photos`, `/photos/${photoId}`, `/photos/${photoId}/image`, `/photos/${photoId}/thumbnail`]) {
      expect((await t.api().get(`/api/v1${path}`).set(bearer(key))).status).toBe(401)
    }
    expect((await t.api().post(`/api/v1/tanks/${tankId}/photos`).set(bearer(key)).attach('photo', image, 'x.jpg')).status).toBe(401)
    expect((await t.api().delete(`/api/v1/photos/${photoId}`).set(bearer(key))).status).toBe(401)
    expect(await t.ctx.models.Photo.findByPk(photoId)).not.toBeNull()
  })
})

describe('a viewer limited to one site', () => {
  let own: { tankId: number; photoId: number }
  let elsewhere: { tankId: number; photoId: number }
  beforeAll(async () => {
    own = await freshPhoto(org.siteIds[0])
    elsewhere = await freshPhoto(org.siteIds[1])
    const res = await t
      .api()
      .patch(`/api/v1/users/${org.users.viewer.id}`)
      .set(as(org, 'owner'))
      .send({ siteIds: [org.siteIds[0]] })
    expect(res.status).toBe(200)
  })
  afterAll(async () => {
    await t.api().patch(`/api/v1/users/${org.users.viewer.id}`).set(as(org, 'owner')).send({ siteIds: [] })
  })

  it("fetches its own site's photo and gets 404 for every view of another site's", async () => {
    for (const suffix of ['', '/image', '/thumbnail']) {
      expect((await t.api().get(`/api/v1/photos/${own.photoId}${suffix}`).set(as(org, 'viewer'))).status).toBe(200)
      const res = await t.api().get(`/api/v1/photos/${elsewhere.photoId}${suffix}`).set(as(org, 'viewer'))
      expect(res.status).toBe(404)
      expect(res.body.error.code).toBe('not_found')
      expect(res.headers['content-type']).toMatch(/json/)
    }
    expect((await t.api().get(`/api/v1/tanks/${elsewhere.tankId}/photos`).set(as(org, 'viewer'))).status).toBe(404)
  })

  it('the exported listing applies the same scope', async () => {
    const viewer: UserActor = {
      kind: 'user',
      userId: org.users.viewer.id,
      organizationId: org.organizationId,
      role: 'viewer',
      siteIds: [org.siteIds[0] as number],
      sessionId: 'probe',
    }
    const range = [new Date(Date.now() - 3600_000), new Date(Date.now() + 3600_000)] as const
    expect((await listTankPhotos(t.ctx, viewer, own.tankId, ...range)).map((p) => p.id)).toEqual([own.photoId])
    await expect(listTankPhotos(t.ctx, viewer, elsewhere.tankId, ...range)).rejects.toMatchObject({ status: 404 })
  })
})

describe('serving', () => {
  it('answers the right type, a private cache header, and 304 for a known ETag', async () => {
    const { photoId } = await freshPhoto()
    const res = await t.api().get(`/api/v1/photos/${photoId}/thumbnail`).set(as(org, 'viewer'))
    expect(res.status).toBe(200)
    expect(res.headers['content-type']).toBe('image/jpeg')
    expect(res.headers['cache-control']).toBe('private, max-age=86400, immutable')
    expect(res.headers['x-content-type-options']).toBe('nosniff')
    const again = await t
      .api()
      .get(`/api/v1/photos/${photoId}/thumbnail`)
      .set(as(org, 'viewer'))
      .set('If-None-Match', res.headers.etag as string)
    expect(again.status).toBe(304)
    // Another caller's ETag does not open the image without permission.
    expect(
      (
        await t
          .api()
          .get(`/api/v1/photos/${photoId}/thumbnail`)
          .set(bearer(other.users.owner.token))
          .set('If-None-Match', res.headers.etag as string)
      ).status,
    ).toBe(404)
  })

  it('a photo whose stored image went missing answers 404 with a message, not 500', async () => {
    const { photoId } = await freshPhoto()
    const row = (await t.ctx.models.Photo.findByPk(photoId))!
    const { rmSync } = await import('node:fs')
    rmSync(`${t.photoDir}/${row.displayKey}`)
    const res = await t.api().get(`/api/v1/photos/${photoId}/image`).set(as(org, 'owner'))
    expect(res.status).toBe(404)
    expect(res.body.error.message).toMatch(/missing from the photo store/)
  })

  it('lists newest first, and the period list for other code oldest first, within [from, to)', async () => {
    const tankId = await newTank(t, org)
    const ids: number[] = []
    for (const takenAt of ['2026-11-02T10:00:00Z', '2026-11-05T10:00:00Z', '2026-11-09T10:00:00Z']) {
      const res = await t
        .api()
        .post(`/api/v1/tanks/${tankId}/photos`)
        .set(as(org, 'owner'))
        .field('takenAt', takenAt)
        .field('caption', takenAt.slice(0, 10))
        .attach('photo', image, 'x.jpg')
      ids.push(res.body.id)
    }
    const list = await t.api().get(`/api/v1/tanks/${tankId}/photos`).set(as(org, 'viewer'))
    expect(list.body.map((p: { id: number }) => p.id)).toEqual([...ids].reverse())
    const week = await photosInPeriod(t.ctx, tankId, new Date('2026-11-02T10:00:00Z'), new Date('2026-11-09T10:00:00Z'))
    expect(week).toEqual([
      { id: ids[0], takenAt: '2026-11-02T10:00:00.000Z', caption: '2026-11-02', thumbnailUrl: `/api/v1/photos/${ids[0]}/thumbnail` },
      { id: ids[1], takenAt: '2026-11-05T10:00:00.000Z', caption: '2026-11-05', thumbnailUrl: `/api/v1/photos/${ids[1]}/thumbnail` },
    ])
    const bytes = await readPhotoBytes(t.ctx, ids[0] as number, 'thumbnail')
    expect(bytes.subarray(0, 3)).toEqual(Buffer.from([0xff, 0xd8, 0xff]))
  })
})

describe('delete', () => {
  it('removes the row and both stored images; a second delete is 404', async () => {
    const { photoId } = await freshPhoto()
    const row = (await t.ctx.models.Photo.findByPk(photoId))!
    expect(filesUnder(t.photoDir)).toEqual(expect.arrayContaining([row.displayKey, row.thumbnailKey]))
    expect((await t.api().delete(`/api/v1/photos/${photoId}`).set(as(org, 'viewer'))).status).toBe(403)
    expect(await t.ctx.models.Photo.findByPk(photoId)).not.toBeNull()
    expect((await t.api().delete(`/api/v1/photos/${photoId}`).set(as(org, 'keeper'))).status).toBe(204)
    expect(await t.ctx.models.Photo.findByPk(photoId)).toBeNull()
    const files = filesUnder(t.photoDir)
    expect(files).not.toContain(row.displayKey)
    expect(files).not.toContain(row.thumbnailKey)
    expect((await t.api().delete(`/api/v1/photos/${photoId}`).set(as(org, 'keeper'))).status).toBe(404)
    expect((await t.api().get(`/api/v1/photos/${photoId}/image`).set(as(org, 'keeper'))).status).toBe(404)
  })

  it('another organization cannot delete, and the photo stays', async () => {
    const { photoId } = await freshPhoto()
    expect((await t.api().delete(`/api/v1/photos/${photoId}`).set(bearer(other.users.owner.token))).status).toBe(404)
    expect(await t.ctx.models.Photo.findByPk(photoId)).not.toBeNull()
  })
})
