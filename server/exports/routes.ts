import { once } from 'node:events'
import { Router, type Request, type Response } from 'express'
import { stringify } from 'csv-stringify'
import { idParamsSchema } from '@shared/schemas/common'
import { EXPORT_KINDS, exportRangeQuerySchema, type ExportKind } from '@shared/schemas/exports'
import { guardRow } from '@shared/csv/formula-guard'
import { allow, actorOf } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { exportCsvService, type CsvSink, type ExportScope } from './csv'
import { attachment } from './format'

/** A sink writing guarded, quoted CSV (RFC 4180 line ends) to the response, waiting when the client is slow. */
function responseSink(res: Response): CsvSink & { end(): void } {
  const csv = stringify({ record_delimiter: 'windows' })
  return {
    begin(fileName, header) {
      res.status(200)
      res.setHeader('Content-Type', 'text/csv; charset=utf-8')
      res.setHeader('Content-Disposition', attachment(fileName))
      res.setHeader('Cache-Control', 'no-store')
      csv.pipe(res)
      csv.write(header)
    },
    async rows(rows) {
      for (const row of rows) {
        if (!csv.write(guardRow(row))) await Promise.race([once(csv, 'drain'), once(res, 'close')])
        if (res.destroyed) return false
      }
      return true
    },
    end() {
      csv.end()
    },
  }
}

/** GET /<tanks|sites>/:id/exports/<kind>.csv?from&to for each kind of CSV export. */
export function exportRoutes(ctx: AppContext, scopeKind: ExportScope['kind']) {
  const router = Router()
  const service = exportCsvService(ctx)
  for (const kind of EXPORT_KINDS as readonly ExportKind[]) {
    router.get(`/:id/exports/${kind}.csv`, allow('org.read'), async (req: Request, res: Response) => {
      const { id } = parse(idParamsSchema, req, 'params')
      const range = parse(exportRangeQuerySchema, req, 'query')
      const sink = responseSink(res)
      try {
        await service.write(actorOf(req), kind, { kind: scopeKind, id }, range, sink)
        sink.end()
      } catch (error) {
        // Once the first rows are out, the status is sent: all that is left is to cut the download short.
        if (!res.headersSent) throw error
        ctx.logger.error({ err: error, kind }, 'export failed part way')
        res.destroy(error as Error)
      }
    })
  }
  return router
}
