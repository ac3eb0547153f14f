import type { RequestHandler } from 'express'
import multer from 'multer'
import { multipartUpload } from '../platform/http/upload'
import { importFiles } from './files'

/**
 * One CSV file streamed straight to disk under the data folder, named by a random key of ours
 * (the uploader's name is kept only as text). Larger than the limit answers 413 and leaves nothing behind.
 */
export function csvUpload(dataDir: string, maxMb: number): RequestHandler {
  const files = importFiles(dataDir)
  return multipartUpload({
    field: 'file',
    maxBytes: Math.floor(maxMb * 1024 * 1024),
    storage: multer.diskStorage({
      destination: (_req, _file, done) => done(null, files.ensureDir()),
      filename: (_req, _file, done) => done(null, `${files.newKey()}.csv`),
    }),
    fields: 5,
    fieldSize: 1024,
    tooLargeMessage: `The file is larger than the import limit of ${maxMb} MB`,
    requiredMessage: 'choose a CSV file to upload',
  })
}

/** Our key, from the stored file's name; never derived from what the uploader sent. */
export const uploadedKey = (filename: string) => filename.replace(/\.csv$/, '')
