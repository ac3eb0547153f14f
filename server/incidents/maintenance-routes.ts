import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { maintenanceInputSchema, maintenanceRangeSchema } from '@shared/schemas/maintenance'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { maintenanceService } from './maintenance-windows'

/** Mounted under /sites: a site's maintenance windows. */
export function siteMaintenanceRoutes(ctx: AppContext) {
  const router = Router()
  const id = (req: Request) => parse(idParamsSchema, req, 'params').id
  router.get('/:id/maintenance-windows', allow('org.read'), async (req, res) => {
    res.json(await maintenanceService(ctx).list(actorOf(req), id(req), parse(maintenanceRangeSchema, req, 'query')))
  })
  router.post('/:id/maintenance-windows', allow('maintenance.write'), async (req, res) => {
    res.status(201).json(await maintenanceService(ctx).create(actorOf(req), id(req), parse(maintenanceInputSchema, req, 'body')))
  })
  return router
}

/** /maintenance-windows/:id */
export function maintenanceRouter(ctx: AppContext) {
  const router = Router()
  router.post('/:id/cancel', allow('maintenance.write'), async (req, res) => {
    res.json(await maintenanceService(ctx).cancel(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  return router
}
