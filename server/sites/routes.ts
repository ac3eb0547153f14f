import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { siteInputSchema, siteListQuerySchema, siteUpdateSchema } from '@shared/schemas/sites'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { sitesService } from './sites'

export function sitesRouter(ctx: AppContext) {
  const router = Router()
  const sites = sitesService(ctx)

  router.get('/', allow('org.read'), async (req, res) => {
    const { includeArchived } = parse(siteListQuerySchema, req, 'query')
    res.json(await sites.list(actorOf(req), includeArchived))
  })
  router.get('/:id', allow('org.read'), async (req, res) => {
    res.json(await sites.get(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/', allow('sites.write'), async (req, res) => {
    res.status(201).json(await sites.create(actorOf(req), parse(siteInputSchema, req, 'body')))
  })
  router.patch('/:id', allow('sites.write'), async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    res.json(await sites.update(actorOf(req), id, parseChanges(siteUpdateSchema, req)))
  })
  router.post('/:id/archive', allow('sites.write'), async (req, res) => {
    res.json(await sites.setArchived(actorOf(req), parse(idParamsSchema, req, 'params').id, true))
  })
  router.post('/:id/unarchive', allow('sites.write'), async (req, res) => {
    res.json(await sites.setArchived(actorOf(req), parse(idParamsSchema, req, 'params').id, false))
  })
  return router
}
