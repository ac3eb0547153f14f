import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { buildPlanSchema, buildReportMailSchema, buildStartSchema, buildStepDoneSchema, buildStepParamsSchema } from '@shared/schemas/build'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { buildReportService } from './build-report'
import { buildsService } from './builds'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id

/** Mounted under /tanks: a tank's build plan, its dated timeline, the templates and the build report. */
export function buildRoutes(ctx: AppContext) {
  const router = Router()
  const builds = buildsService(ctx)
  const reports = buildReportService(ctx)

  router.get('/:id/build', allow('org.read'), async (req, res) => {
    res.json(await builds.get(actorOf(req), id(req)))
  })
  router.put('/:id/build/plan', allow('builds.write'), async (req, res) => {
    res.json(await builds.savePlan(actorOf(req), id(req), parse(buildPlanSchema, req, 'body')))
  })
  router.post('/:id/build/start', allow('builds.write'), async (req, res) => {
    res.json(await builds.start(actorOf(req), id(req), parse(buildStartSchema, req, 'body')))
  })
  router.post('/:id/build/steps/:key/done', allow('builds.write'), async (req, res) => {
    const p = parse(buildStepParamsSchema, req, 'params')
    res.json(await builds.tick(actorOf(req), p.id, p.key, parse(buildStepDoneSchema, req, 'body')))
  })
  router.get('/:id/build/templates', allow('org.read'), async (req, res) => {
    res.json(await builds.templates(actorOf(req), id(req)))
  })
  router.get('/:id/build/report/pdf', allow('org.read'), async (req, res) => {
    const { pdf, fileName } = await reports.pdf(actorOf(req), id(req))
    res.type('application/pdf').set('Content-Disposition', `attachment; filename="${fileName}"`).send(pdf)
  })
  router.post('/:id/build/report/mail', allow('builds.write'), async (req, res) => {
    res.json(await reports.mail(actorOf(req), id(req), parse(buildReportMailSchema, req, 'body').emails))
  })
  return router
}
