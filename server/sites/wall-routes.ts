import compression from 'compression'
import { Router, type RequestHandler } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { wallCredentialInputSchema, wallQuerySchema, wallTrendsQuerySchema } from '@shared/schemas/wall'
import { actorOf, allow, viewerOf } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { wallService } from './wall'

/**
 * GET /sites/:id/wall and /sites/:id/wall/trends — for people and for the site's own wall displays. Sent compressed: a large
 * site's wall is megabytes of JSON, often to a TV on Wi-Fi.
 */
export function wallRoute(ctx: AppContext, personOrWall: RequestHandler) {
  const router = Router()
  router.get('/:id/wall', personOrWall, allow('wall.read'), compression(), async (req, res) => {
    const { trends } = parse(wallQuerySchema, req, 'query')
    res.json(await wallService(ctx).get(viewerOf(req), parse(idParamsSchema, req, 'params').id, trends))
  })
  router.get('/:id/wall/trends', personOrWall, allow('wall.read'), compression(), async (req, res) => {
    const { tankIds } = parse(wallTrendsQuerySchema, req, 'query')
    res.json(await wallService(ctx).trends(viewerOf(req), parse(idParamsSchema, req, 'params').id, tankIds))
  })
  return router
}

/** Mounted under /sites (owner): the wall displays of a site. */
export function siteWallCredentialRoutes(ctx: AppContext) {
  const router = Router()
  router.get('/:id/wall-credentials', allow('walls.manage'), async (req, res) => {
    res.json(await wallService(ctx).listCredentials(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/:id/wall-credentials', allow('walls.manage'), async (req, res) => {
    const { name } = parse(wallCredentialInputSchema, req, 'body')
    res.status(201).json(await wallService(ctx).createCredential(actorOf(req), parse(idParamsSchema, req, 'params').id, name))
  })
  return router
}

export function wallCredentialsRouter(ctx: AppContext) {
  const router = Router()
  router.post('/:id/revoke', allow('walls.manage'), async (req, res) => {
    res.json(await wallService(ctx).revokeCredential(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  return router
}
