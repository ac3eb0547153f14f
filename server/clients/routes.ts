import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { clientInputSchema, clientListQuerySchema, clientUpdateSchema } from '@shared/schemas/clients'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { clientsService } from './clients'

/** Mounted at /clients: the business's clients, read by its staff and kept by its owners. */
export function clientsRouter(ctx: AppContext) {
  const router = Router()
  const clients = clientsService(ctx)
  const id = (req: Request) => parse(idParamsSchema, req, 'params').id

  router.get('/', allow('clients.read'), async (req, res) => {
    res.json(await clients.list(actorOf(req), parse(clientListQuerySchema, req, 'query').includeArchived))
  })
  router.get('/:id', allow('clients.read'), async (req, res) => {
    res.json(await clients.get(actorOf(req), id(req)))
  })
  router.post('/', allow('clients.manage'), async (req, res) => {
    res.status(201).json(await clients.create(actorOf(req), parse(clientInputSchema, req, 'body')))
  })
  router.patch('/:id', allow('clients.manage'), async (req, res) => {
    res.json(await clients.update(actorOf(req), id(req), parseChanges(clientUpdateSchema, req)))
  })
  router.post('/:id/archive', allow('clients.manage'), async (req, res) => {
    res.json(await clients.setArchived(actorOf(req), id(req), true))
  })
  router.post('/:id/unarchive', allow('clients.manage'), async (req, res) => {
    res.json(await clients.setArchived(actorOf(req), id(req), false))
  })
  return router
}
