import { PHOTO_FORMATS } from '@shared/schemas/photos'
import { AppError, badRequest } from '../platform/errors'
import type { PhotoFormat } from './model'
import { createLimiter, LimiterFullError } from '../platform/limiter'

// Loaded on the first photo, not at start-up: an instance that never takes a photo keeps ~25 MB.
// Without libvips' operation cache the memory of a decode is returned when it ends, and one thread
// per decode keeps a decode off the other cores (and the allocator's per-thread arenas few).
const loadSharp = () =>
  import('sharp').then((m) => {
    m.default.cache(false)
    m.default.concurrency(1)
    return m.default
  })

export const DISPLAY_MAX_PX = 1600
export const THUMBNAIL_MAX_PX = 320
/** Above the 48-megapixel phone cameras; refuses decompression bombs before a pixel is decoded. */
export const MAX_INPUT_PIXELS = 50_000_000
/** Decodes at once per instance, and uploads that may wait for one; more answer 503. */
export const DECODES_AT_ONCE = 2
export const DECODES_WAITING = 8
const decodes = createLimiter(DECODES_AT_ONCE, DECODES_WAITING)
export const decodeStats = () => decodes.stats()

export type ProcessedImage = { data: Buffer; width: number; height: number }
export type ProcessedPhoto = { originalFormat: PhotoFormat; display: ProcessedImage; thumbnail: ProcessedImage }

const ACCEPTED = 'attach a JPEG, PNG or WebP image'

/**
 * Decides the type from the bytes alone, then re-encodes: sharp's output carries no EXIF, GPS or
 * other metadata unless asked to, and `.rotate()` first applies the camera's orientation tag so the
 * stripped image still stands the right way up. JPEG output on a white ground, so PDF writers and
 * every browser can show it.
 */
export async function processPhoto(bytes: Buffer): Promise<ProcessedPhoto> {
  const sharp = await loadSharp()
  let format: string | undefined
  let pixels: number
  try {
    const meta = await sharp(bytes, { limitInputPixels: false }).metadata()
    format = meta.format
    pixels = (meta.width ?? 0) * (meta.height ?? 0)
  } catch {
    throw badRequest(`photo: not a readable image; ${ACCEPTED}`, { photo: `not a readable image; ${ACCEPTED}` })
  }
  if (!format || !(PHOTO_FORMATS as readonly string[]).includes(format)) {
    throw badRequest(`photo: ${format ?? 'unknown'} images are not accepted; ${ACCEPTED}`, { photo: `${format ?? 'unknown'} is not accepted; ${ACCEPTED}` })
  }
  if (pixels > MAX_INPUT_PIXELS) {
    throw new AppError(413, 'too_large', `photo: ${Math.round(pixels / 1e6)} megapixels is more than the ${MAX_INPUT_PIXELS / 1e6} accepted`, {
      photo: `at most ${MAX_INPUT_PIXELS / 1e6} megapixels`,
    })
  }
  try {
    // One decode of the upload; the thumbnail is made from the display image.
    const display = await decodes.run(() => variant(bytes, DISPLAY_MAX_PX, 82))
    const thumbnail = await variant(display.data, THUMBNAIL_MAX_PX, 76)
    return { originalFormat: format as PhotoFormat, display, thumbnail }
  } catch (error) {
    if (error instanceof LimiterFullError) {
      throw new AppError(503, 'busy', 'Too many photos are being processed right now; send it again in a few seconds', undefined, 5)
    }
    // The header parsed but the pixels did not (a truncated or damaged file).
    throw badRequest(`photo: the image data is damaged or incomplete; ${ACCEPTED}`, { photo: 'damaged or incomplete image' })
  }
}

async function variant(bytes: Buffer, maxPx: number, quality: number): Promise<ProcessedImage> {
  const sharp = await loadSharp()
  const { data, info } = await sharp(bytes, { limitInputPixels: MAX_INPUT_PIXELS, failOn: 'error' })
    .rotate()
    .resize({ width: maxPx, height: maxPx, fit: 'inside', withoutEnlargement: true })
    .flatten({ background: '#ffffff' })
    .jpeg({ quality, mozjpeg: true })
    .toBuffer({ resolveWithObject: true })
  return { data, width: info.width, height: info.height }
}
