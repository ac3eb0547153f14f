import { Router, type Request, type Response } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { reportQuerySchema, reportScheduleInputSchema, reportScheduleUpdateSchema } from '@shared/schemas/reports'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { reportFileName } from './mail'
import { renderReportPdf } from './pdf'
import { reportService, type ReportKind } from './report'
import { reportSchedulesService } from './schedules'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id

/** GET /:id/report and /:id/report/pdf for a tank (under /tanks), a site (under /sites) or a client (under /clients). */
export function reportRoutes(ctx: AppContext, kind: ReportKind) {
  const router = Router()
  const reports = reportService(ctx)
  const build = (req: Request) => reports.report(actorOf(req), kind, id(req), parse(reportQuerySchema, req, 'query'))

  router.get('/:id/report', allow('reports.read'), async (req, res) => {
    res.json(await build(req))
  })
  router.get('/:id/report/pdf', allow('reports.read'), async (req, res: Response) => {
    const report = await build(req)
    const pdf = await renderReportPdf(report)
    res
      .type('application/pdf')
      .set('Content-Disposition', `attachment; filename="${reportFileName(report)}"`)
      .send(pdf)
  })
  return router
}

/** Mounted at /report-schedules: owners manage who gets which report, and may send one now. */
export function reportSchedulesRouter(ctx: AppContext) {
  const router = Router()
  const schedules = reportSchedulesService(ctx)
  router.get('/', allow('reports.manage'), async (req, res) => {
    res.json(await schedules.list(actorOf(req)))
  })
  router.post('/', allow('reports.manage'), async (req, res) => {
    res.status(201).json(await schedules.create(actorOf(req), parse(reportScheduleInputSchema, req, 'body')))
  })
  router.patch('/:id', allow('reports.manage'), async (req, res) => {
    res.json(await schedules.update(actorOf(req), id(req), parseChanges(reportScheduleUpdateSchema, req)))
  })
  router.delete('/:id', allow('reports.manage'), async (req, res) => {
    await schedules.remove(actorOf(req), id(req))
    res.status(204).end()
  })
  router.post('/:id/send-now', allow('reports.manage'), async (req, res) => {
    res.json(await schedules.sendNow(actorOf(req), id(req)))
  })
  return router
}
