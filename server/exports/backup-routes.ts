import { Router } from 'express'
import multer from 'multer'
import { MAX_BACKUP_BYTES } from '@shared/schemas/exports'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { multipartUpload } from '../platform/http/upload'
import { backupExportService, RESTORE_NOTES } from './backup-export'
import { backupImportService, parseBackup } from './backup-import'
import { attachment } from './format'

const receiveFile = multipartUpload({
  field: 'file',
  maxBytes: MAX_BACKUP_BYTES,
  storage: multer.memoryStorage(),
  fields: 5,
  tooLargeMessage: `The backup file is larger than the limit (${MAX_BACKUP_BYTES} bytes)`,
  requiredMessage: 'choose a backup file to restore',
})

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
    const backup = parseBackup(req.file!.buffer)
    const summary = await importer.restore(actorOf(req), backup)
    res.status(201).json({ ...summary, notes: RESTORE_NOTES })
  })
  return router
}
