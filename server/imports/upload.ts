import type { RequestHandler } from 'express'
import multer from 'multer'
import { AppError } from '../errors'
import { importFiles } from './files'

/**
 * One CSV file streamed straight to disk under the data folder, named by a random key of ours
 * (the uploader's name is kept only as text). Larger than the limit answers 413 and leaves nothing behind.
 */
export function csvUpload(dataDir: string, maxMb: number): RequestHandler {
  const files = importFiles(dataDir)
  const upload = multer({
    storage: multer.diskStorage({
      destination: (_req, _file, done) => done(null, files.ensureDir()),
      filename: (_req, _file, done) => done(null, `${files.newKey()}.csv`),
    }),
    limits: { fileSize: Math.floor(maxMb * 1024 * 1024), files: 1, fields: 5, fieldSize: 1024 },
  }).single('file')
  return (req, res, next) => {
    upload(req, res, (error: unknown) => {
      if (!error) {
        if (!req.file) return next(new AppError(400, 'invalid_input', 'file: choose a CSV file to upload', { file: 'required' }))
        return next()
      }
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') return next(new AppError(413, 'too_large', `The file is larger than the import limit of ${maxMb} MB`))
        return next(new AppError(400, 'invalid_input', `file: ${error.message}`, { [error.field ?? 'file']: error.message }))
      }
      next(error)
    })
  }
}

/** Our key, from the stored file's name; never derived from what the uploader sent. */
export const uploadedKey = (filename: string) => filename.replace(/\.csv$/, '')
