import { randomUUID } from 'node:crypto'
import type { Readable } from 'node:stream'
import { Op } from 'sequelize'
import type { PhotoSummary, PhotoUploadFields, PhotoVariant, PublicPhoto } from '@shared/schemas/photos'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { Photo } from '../models'
import { photoStoreFor, StoredObjectMissing } from './storage'
import { instantNotAhead } from '../care'
import { processPhoto } from './photo-images'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

const API = '/api/v1'
const MAX_LISTED = 500
export const photoUrl = (id: number, variant: PhotoVariant) => `${API}/photos/${id}/${variant === 'display' ? 'image' : 'thumbnail'}`

export async function presentPhotos(ctx: AppContext, photos: Photo[]): Promise<PublicPhoto[]> {
  const userIds = [...new Set(photos.map((p) => p.uploadedBy).filter((id): id is number => id !== null))]
  const users = userIds.length ? await ctx.models.User.findAll({ attributes: ['id', 'name'], where: { id: userIds } }) : []
  const names = new Map(users.map((u) => [u.id, u.name]))
  return photos.map((p) => ({
    id: p.id,
    tankId: p.tankId,
    careLogEntryId: p.careLogEntryId,
    caption: p.caption,
    takenAt: p.takenAt.toISOString(),
    uploadedBy: p.uploadedBy === null ? null : { id: p.uploadedBy, name: names.get(p.uploadedBy) ?? 'former user' },
    createdAt: p.createdAt.toISOString(),
    contentType: p.contentType,
    display: { url: photoUrl(p.id, 'display'), width: p.displayWidth, height: p.displayHeight, bytes: p.displayBytes },
    thumbnail: { url: photoUrl(p.id, 'thumbnail'), width: p.thumbnailWidth, height: p.thumbnailHeight },
  }))
}

function periodWhere(range: { from?: Date; to?: Date }) {
  const takenAt: Record<symbol, Date> = {}
  if (range.from) takenAt[Op.gte] = range.from
  if (range.to) takenAt[Op.lt] = range.to
  return range.from || range.to ? { takenAt } : {}
}

/**
 * A tank's photos taken in [from, to), oldest first, for server code that has already decided the
 * reader may see the tank (the scheduled client report has no signed-in caller). The thumbnail URL
 * answers only with a token that may see the tank; `readPhotoBytes` gives the bytes directly.
 */
export async function photosInPeriod(ctx: AppContext, tankId: number, from: Date, to: Date): Promise<PhotoSummary[]> {
  const photos = await ctx.models.Photo.findAll({
    where: { tankId, ...periodWhere({ from, to }) },
    order: [
      ['takenAt', 'ASC'],
      ['id', 'ASC'],
    ],
    limit: MAX_LISTED,
  })
  return photos.map((p) => ({ id: p.id, takenAt: p.takenAt.toISOString(), caption: p.caption, thumbnailUrl: photoUrl(p.id, 'thumbnail') }))
}

/** The same list with the caller's permissions: another site's or organization's tank is a 404. */
export async function listTankPhotos(ctx: AppContext, actor: UserActor, tankId: number, from: Date, to: Date): Promise<PhotoSummary[]> {
  const tank = await visibleTank(ctx, actor, tankId)
  return photosInPeriod(ctx, tank.id, from, to)
}

/** One stored variant as a Buffer (e.g. to embed in a PDF); JPEG bytes. */
export async function readPhotoBytes(ctx: AppContext, photoId: number, variant: PhotoVariant): Promise<Buffer> {
  const photo = await ctx.models.Photo.findByPk(photoId)
  if (!photo) throw notFound('Photo not found')
  const chunks: Buffer[] = []
  for await (const chunk of await photoStoreFor(ctx.config).getStream(variant === 'display' ? photo.displayKey : photo.thumbnailKey))
    chunks.push(Buffer.from(chunk))
  return Buffer.concat(chunks)
}

export const photosService = perContext((ctx: AppContext) => {
  const store = () => photoStoreFor(ctx.config)

  async function find(actor: UserActor, id: number) {
    const photo = await ctx.models.Photo.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!photo) throw notFound('Photo not found')
    // The tank decides: a viewer limited to other sites gets the same 404 as a stranger.
    try {
      await visibleTank(ctx, actor, photo.tankId)
    } catch {
      throw notFound('Photo not found')
    }
    return photo
  }

  async function checkCareLogEntry(tankId: number, entryId: number | undefined) {
    if (entryId === undefined) return null
    const entry = await ctx.models.CareLogEntry.findOne({ where: { id: entryId, tankId }, attributes: ['id'] })
    if (!entry) throw badRequest('careLogEntryId: no such care-log entry on this tank', { careLogEntryId: 'no such care-log entry on this tank' })
    return entry.id
  }

  return {
    find,

    async list(actor: UserActor, tankId: number, range: { from?: string; to?: string }) {
      const tank = await visibleTank(ctx, actor, tankId)
      const photos = await ctx.models.Photo.findAll({
        where: { tankId: tank.id, ...periodWhere({ from: range.from ? new Date(range.from) : undefined, to: range.to ? new Date(range.to) : undefined }) },
        order: [
          ['takenAt', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: MAX_LISTED,
      })
      return presentPhotos(ctx, photos)
    },

    async get(actor: UserActor, id: number) {
      return (await presentPhotos(ctx, [await find(actor, id)]))[0] as PublicPhoto
    },

    /** Nothing is kept of a refused upload: the row is written last, and stored objects are removed if it fails. */
    async upload(actor: UserActor, tankId: number, bytes: Buffer | undefined, fields: PhotoUploadFields): Promise<PublicPhoto> {
      const tank = await visibleTank(ctx, actor, tankId)
      if (!bytes || bytes.length === 0) throw badRequest('photo: attach a JPEG, PNG or WebP image', { photo: 'attach a JPEG, PNG or WebP image' })
      const takenAt = instantNotAhead(fields.takenAt, 'takenAt')
      const careLogEntryId = await checkCareLogEntry(tank.id, fields.careLogEntryId)
      const processed = await processPhoto(bytes)
      const stem = `${actor.organizationId}/${tank.id}/${randomUUID()}`
      const displayKey = `${stem}-display.jpg`
      const thumbnailKey = `${stem}-thumb.jpg`
      try {
        await store().put(displayKey, processed.display.data, 'image/jpeg')
        await store().put(thumbnailKey, processed.thumbnail.data, 'image/jpeg')
        const photo = await ctx.models.Photo.create({
          organizationId: actor.organizationId,
          tankId: tank.id,
          careLogEntryId,
          caption: fields.caption,
          takenAt,
          uploadedBy: actor.userId,
          contentType: 'image/jpeg',
          displayKey,
          displayWidth: processed.display.width,
          displayHeight: processed.display.height,
          displayBytes: processed.display.data.length,
          thumbnailKey,
          thumbnailWidth: processed.thumbnail.width,
          thumbnailHeight: processed.thumbnail.height,
          originalFormat: processed.originalFormat,
        })
        return (await presentPhotos(ctx, [photo]))[0] as PublicPhoto
      } catch (error) {
        await Promise.allSettled([store().delete(displayKey), store().delete(thumbnailKey)])
        throw error
      }
    },

    async open(actor: UserActor, id: number, variant: PhotoVariant): Promise<{ photo: Photo; stream: Readable }> {
      const photo = await find(actor, id)
      try {
        return { photo, stream: await store().getStream(variant === 'display' ? photo.displayKey : photo.thumbnailKey) }
      } catch (error) {
        if (!(error instanceof StoredObjectMissing)) throw error
        ctx.logger.error({ photoId: id, key: error.key }, 'photo row without its stored image')
        throw notFound('The image of this photo is missing from the photo store')
      }
    },

    /** The row goes first, so no listing ever points at a removed image; a failed object delete is logged. */
    async remove(actor: UserActor, id: number) {
      const photo = await find(actor, id)
      await photo.destroy()
      const results = await Promise.allSettled([store().delete(photo.displayKey), store().delete(photo.thumbnailKey)])
      for (const result of results) {
        if (result.status === 'rejected') ctx.logger.warn({ err: result.reason, photoId: id }, 'a deleted photo left an object in the photo store')
      }
    },
  }
})
