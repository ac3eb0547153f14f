import { Router } from 'express'
import { z } from 'zod'
import { idParamsSchema } from '@shared/schemas/common'
import { ackLinkSchema, incidentListQuerySchema, incidentNoteSchema, resolveNoteSchema } from '@shared/schemas/incidents'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { ackLinksService } from './ack-links'
import { incidentsOf } from './incidents'

export function incidentsRouter(ctx: AppContext) {
  const router = Router()
  const id = (req: Parameters<typeof parse>[1]) => parse(idParamsSchema, req, 'params').id
  router.get('/', allow('org.read'), async (req, res) => {
    res.json(await incidentsOf(ctx).list(actorOf(req), parse(incidentListQuerySchema, req, 'query')))
  })
  router.get('/:id', allow('org.read'), async (req, res) => {
    res.json(await incidentsOf(ctx).get(actorOf(req), id(req)))
  })
  router.post('/:id/acknowledge', allow('incidents.handle'), async (req, res) => {
    res.json(await incidentsOf(ctx).acknowledge(actorOf(req), id(req), parse(incidentNoteSchema, req, 'body').note))
  })
  router.post('/:id/resolve', allow('incidents.handle'), async (req, res) => {
    res.json(await incidentsOf(ctx).resolveByHand(actorOf(req), id(req), parse(resolveNoteSchema, req, 'body').note))
  })
  return router
}

/** Open routes behind the secret in an alert mail: look at the link, then use it once. */
export function ackLinksRouter(ctx: AppContext) {
  const router = Router()
  router.get('/:token', async (req, res) => {
    const { token } = parse(z.object({ token: z.string().min(20).max(200) }), req, 'params')
    res.json(await ackLinksService(ctx).describe(token))
  })
  router.post('/use', async (req, res) => {
    const { token, note } = parse(ackLinkSchema, req, 'body')
    res.json(await ackLinksService(ctx).use(token, note))
  })
  return router
}
