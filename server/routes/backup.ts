import { Router, type NextFunction, type Request, type Response } from 'express'
import multer from 'multer'
import { MAX_BACKUP_BYTES } from '@shared/schemas/exports'
import { actorOf, allow } from '../auth/middleware'
import type { AppContext } from '../context'
import { AppError, badRequest } from '../errors'
import { backupExportService, RESTORE_NOTES } from '../services/backup-export'
import { backupImportService, parseBackup } from '../services/backup-import'
import { attachment } from '../services/export-format'

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_BACKUP_BYTES, files: 1, fields: 5 } })

/** multer's own errors as ours: an oversized file is a 413 with the limit, the rest a 400. */
function receiveFile(req: Request, res: Response, next: NextFunction) {
  upload.single('file')(req, res, (error?: unknown) => {
    if (!error) return next()
    if (error instanceof multer.MulterError) {
      if (error.code === 'LIMIT_FILE_SIZE') {
        return next(new AppError(413, 'too_large', `The backup file is larger than the limit (${MAX_BACKUP_BYTES} bytes)`))
      }
      return next(badRequest(`file: ${error.message}`, { file: error.message }))
    }
    next(error)
  })
}

/** GET /backup downloads the whole organization; POST /backup/restore loads one into an empty organization. */
export function backupRouter(ctx: AppContext) {
  const router = Router()
  const exporter = backupExportService(ctx)
  const importer = backupImportService(ctx)

  router.get('/', allow('org.backup'), async (req, res) => {
    try {
      await exporter.write(actorOf(req), res, (organizationName) => {
        res.status(200)
        res.setHeader('Content-Type', 'application/json; charset=utf-8')
        res.setHeader('Content-Disposition', attachment(exporter.fileName(organizationName)))
        res.setHeader('Cache-Control', 'no-store')
      })
      res.end()
    } catch (error) {
      if (!res.headersSent) throw error
      ctx.logger.error({ err: error }, 'backup export failed part way')
      res.destroy(error as Error)
    }
  })

  router.post('/restore', allow('org.backup'), receiveFile, async (req, res) => {
    if (!req.file) throw badRequest('file: choose a backup file to restore', { file: 'required' })
    const backup = parseBackup(req.file.buffer)
    const summary = await importer.restore(actorOf(req), backup)
    res.status(201).json({ ...summary, notes: RESTORE_NOTES })
  })
  return router
}
