import { pipeline } from 'node:stream/promises'
import { Router, type Request, type RequestHandler } from 'express'
import multer from 'multer'
import { idParamsSchema } from '@shared/schemas/common'
import { photoListQuerySchema, photoUploadFieldsSchema, type PhotoVariant } from '@shared/schemas/photos'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { multipartUpload } from '../platform/http/upload'
import { parse } from '../platform/http/validate'
import { photosService } from './photos'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id
export const PHOTO_FIELD = 'photo'

/** One image in memory, size-capped; a missing image is the service's 400 (it names the accepted kinds). */
function photoUpload(maxBytes: number): RequestHandler {
  const megabytes = Math.round((maxBytes / (1024 * 1024)) * 10) / 10
  return multipartUpload({
    field: PHOTO_FIELD,
    maxBytes,
    storage: multer.memoryStorage(),
    fields: 10,
    fieldSize: 4096,
    tooLargeMessage: `photo: the image is larger than the ${megabytes} MB limit`,
  })
}

/** Mounted under /tanks: a tank's photo timeline and uploads. */
export function tankPhotoRoutes(ctx: AppContext) {
  const router = Router()
  const photos = photosService(ctx)
  router.get('/:id/photos', allow('org.read'), async (req, res) => {
    res.json(await photos.list(actorOf(req), id(req), parse(photoListQuerySchema, req, 'query')))
  })
  // The role is checked before the body is read: a viewer's upload is refused without buffering it.
  router.post('/:id/photos', allow('photos.write'), photoUpload(ctx.config.photos.maxBytes), async (req, res) => {
    const tankId = id(req)
    const fields = parse(photoUploadFieldsSchema, req, 'body')
    res.status(201).json(await photos.upload(actorOf(req), tankId, req.file?.buffer, fields))
  })
  return router
}

/** Mounted under /photos: one photo's details, its two images, and delete. */
export function photosRouter(ctx: AppContext) {
  const router = Router()
  const photos = photosService(ctx)

  router.get('/:id', allow('org.read'), async (req, res) => {
    res.json(await photos.get(actorOf(req), id(req)))
  })
  const serve =
    (variant: PhotoVariant): RequestHandler =>
    async (req, res) => {
      const { photo, stream } = await photos.open(actorOf(req), id(req), variant)
      // Each photo's bytes never change (a new upload is a new id), so a private cache may keep them.
      const etag = `"photo-${photo.id}-${variant}"`
      res.setHeader('Cache-Control', 'private, max-age=86400, immutable')
      res.setHeader('ETag', etag)
      if (req.headers['if-none-match'] === etag) {
        stream.destroy()
        return void res.status(304).end()
      }
      res.setHeader('Content-Type', photo.contentType)
      res.setHeader('Content-Disposition', `inline; filename="photo-${photo.id}${variant === 'thumbnail' ? '-thumb' : ''}.jpg"`)
      if (variant === 'display') res.setHeader('Content-Length', String(photo.displayBytes))
      await pipeline(stream, res)
    }
  router.get('/:id/image', allow('org.read'), serve('display'))
  router.get('/:id/thumbnail', allow('org.read'), serve('thumbnail'))
  router.delete('/:id', allow('photos.write'), async (req, res) => {
    await photos.remove(actorOf(req), id(req))
    res.status(204).end()
  })
  return router
}
