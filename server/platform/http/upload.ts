import type { RequestHandler } from 'express'
import multer, { type StorageEngine } from 'multer'
import { AppError, badRequest } from '../errors'

export type UploadOptions = {
  /** The form field that carries the file. */
  field: string
  maxBytes: number
  /** Memory for what is read at once (photos, backups), disk for what is streamed later (imports). */
  storage: StorageEngine
  /** Text fields beside the file: how many, and how long each may be. */
  fields?: number
  fieldSize?: number
  /** The 413's message, naming the limit in the words of the route. */
  tooLargeMessage: string
  /** Set when a request without the file is refused here (400 naming the field) rather than by the service. */
  requiredMessage?: string
}

const CONTROL_CHARACTER = /[\u0000-\u001f\u007f]/
const UNREADABLE = 'unreadable multipart form'

/**
 * The one way a route reads a multipart upload. The route's permission check runs first, so a refused
 * upload is never read; a body over the limit stops at the limit (413); a malformed body (truncated, no
 * boundary, a bad part header, a control character in a file name) is a 400 and leaves nothing behind
 * (multer removes a partly written file).
 */
export function multipartUpload(options: UploadOptions): RequestHandler {
  const { field } = options
  const upload = multer({
    storage: options.storage,
    limits: { fileSize: options.maxBytes, files: 1, fields: options.fields ?? 5, fieldSize: options.fieldSize ?? 4096, parts: (options.fields ?? 5) + 2 },
    fileFilter: (_req, file, accept) => {
      if (CONTROL_CHARACTER.test(file.originalname))
        return accept(badRequest(`${field}: the file name contains a control character`, { [field]: 'the file name contains a control character' }))
      accept(null, true)
    },
  }).single(field)

  return (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) {
        if (!req.file && options.requiredMessage) return next(badRequest(`${field}: ${options.requiredMessage}`, { [field]: 'required' }))
        return next()
      }
      if (error instanceof AppError) return next(error)
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') return next(new AppError(413, 'too_large', options.tooLargeMessage, { [field]: options.tooLargeMessage }))
        if (error.code === 'LIMIT_UNEXPECTED_FILE' || error.code === 'LIMIT_FILE_COUNT') {
          return next(badRequest(`${field}: send one file, in the form field named "${field}"`, { [field]: `send one file in the field "${field}"` }))
        }
        const named = error.field || 'body'
        return next(badRequest(`${named}: ${error.message}`, { [named]: error.message }))
      }
      // Anything else comes from the multipart parser reading a malformed body: the client's fault, not ours.
      next(badRequest(`body: ${UNREADABLE} (${error instanceof Error ? error.message : 'malformed'})`, { body: UNREADABLE }))
    })
  }
}
