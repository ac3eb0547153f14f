import { z } from 'zod'
import { idSchema } from './common'
import { instantSchema } from './time'

export const PHOTO_CAPTION_MAX = 500
export const PHOTO_FORMATS = ['jpeg', 'png', 'webp'] as const
export const PHOTO_VARIANTS = ['display', 'thumbnail'] as const
export type PhotoVariant = (typeof PHOTO_VARIANTS)[number]

const isoInstant = instantSchema

/** The text fields sent beside the image in a multipart upload (all strings on the wire). */
export const photoUploadFieldsSchema = z.object({
  caption: z.string().trim().max(PHOTO_CAPTION_MAX).default(''),
  takenAt: isoInstant.optional(),
  careLogEntryId: idSchema.optional(),
})
export type PhotoUploadFields = z.infer<typeof photoUploadFieldsSchema>
/** The same fields as a client has them, before they become form strings. */
export type PhotoUpload = { caption?: string; takenAt?: string; careLogEntryId?: number }

export const photoListQuerySchema = z.object({ from: isoInstant.optional(), to: isoInstant.optional() })

export interface PublicPhoto {
  id: number
  tankId: number
  careLogEntryId: number | null
  caption: string
  takenAt: string
  uploadedBy: { id: number; name: string } | null
  createdAt: string
  contentType: string
  display: { url: string; width: number; height: number; bytes: number }
  thumbnail: { url: string; width: number; height: number }
}

/** What other parts of the app (the client report) need of a tank's photos in a period. */
export interface PhotoSummary {
  id: number
  takenAt: string
  caption: string
  thumbnailUrl: string
}
