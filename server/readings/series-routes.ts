import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { seriesQuerySchema } from '@shared/schemas/series'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { seriesService } from './series'
import { visibleTank } from '../access/scope'

/** Readings of one tank; mounted under /tanks behind the user token middleware. */
export function seriesRoutes(ctx: AppContext) {
  const router = Router()
  const readings = seriesService(ctx)

  router.get('/:id/series', allow('org.read'), async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    const query = parse(seriesQuerySchema, req, 'query')
    await visibleTank(ctx, actorOf(req), id)
    res.json(await readings.series(id, query))
  })
  router.get('/:id/latest', allow('org.read'), async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    await visibleTank(ctx, actorOf(req), id)
    res.json(await readings.latest(id))
  })
  return router
}
