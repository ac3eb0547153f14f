import { Router } from 'express'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { overviewService } from './overview'

export function overviewRouter(ctx: AppContext) {
  const router = Router()
  const overview = overviewService(ctx)

  router.get('/', allow('overview.read'), async (req, res) => {
    res.json(await overview.get(actorOf(req)))
  })
  return router
}
