import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { roundQuerySchema, visitCloseSchema, visitInputSchema, visitListQuerySchema, visitUpdateSchema } from '@shared/schemas/visits'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { clockStyleOf } from '../people'
import { parse, parseChanges } from '../platform/http/validate'
import { closeVisit } from './close'
import { visitFileName } from './report-mail'
import { renderVisitPdf } from './report-pdf'
import { visitsService } from './visits'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id

/** Mounted at /visits: owners plan, technicians work their own, a client's people read their closed ones. */
export function visitsRouter(ctx: AppContext) {
  const router = Router()
  const visits = visitsService(ctx)

  router.get('/', allow('visits.read'), async (req, res) => {
    res.json(await visits.list(actorOf(req), parse(visitListQuerySchema, req, 'query')))
  })
  router.post('/', allow('visits.manage'), async (req, res) => {
    res.status(201).json(await visits.create(actorOf(req), parse(visitInputSchema, req, 'body')))
  })
  router.get('/:id', allow('visits.read'), async (req, res) => {
    res.json(await visits.get(actorOf(req), id(req)))
  })
  router.patch('/:id', allow('visits.manage'), async (req, res) => {
    res.json(await visits.update(actorOf(req), id(req), parseChanges(visitUpdateSchema, req)))
  })
  router.delete('/:id', allow('visits.manage'), async (req, res) => {
    await visits.remove(actorOf(req), id(req))
    res.status(204).end()
  })
  router.post('/:id/start', allow('visits.work'), async (req, res) => {
    res.json(await visits.start(actorOf(req), id(req)))
  })
  router.post('/:id/close', allow('visits.work'), async (req, res) => {
    res.json(await closeVisit(ctx, actorOf(req), id(req), parse(visitCloseSchema, req, 'body')))
  })
  router.get('/:id/report/pdf', allow('visits.read'), async (req, res) => {
    const actor = actorOf(req)
    const visit = await visits.get(actor, id(req))
    res
      .type('application/pdf')
      .set('Content-Disposition', `attachment; filename="${visitFileName(visit)}"`)
      .send(await renderVisitPdf(ctx, visit, await clockStyleOf(ctx, actor.organizationId)))
  })
  return router
}

/** Mounted at /rounds: a technician's day of visits in order. */
export function roundsRouter(ctx: AppContext) {
  const router = Router()
  const visits = visitsService(ctx)
  router.get('/', allow('visits.work'), async (req, res) => {
    res.json(await visits.round(actorOf(req), parse(roundQuerySchema, req, 'query')))
  })
  return router
}
