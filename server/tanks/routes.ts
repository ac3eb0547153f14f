import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { tankDuplicateSchema, tankInputSchema, tankListQuerySchema, tankUpdateSchema } from '@shared/schemas/tanks'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { tanksService } from './tanks'
import { duplicateTank } from './duplicate'
import { importTanks } from './csv-import'
import { tankImportBodySchema } from '@shared/tank-import'

export function tanksRouter(ctx: AppContext) {
  const router = Router()
  const tanks = tanksService(ctx)

  router.get('/', allow('org.read'), async (req, res) => {
    res.json(await tanks.list(actorOf(req), parse(tankListQuerySchema, req, 'query')))
  })
  router.post('/import', allow('tanks.write'), async (req, res) => {
    res.status(201).json(await importTanks(ctx, actorOf(req), parse(tankImportBodySchema, req, 'body').csv))
  })
  router.get('/:id', allow('org.read'), async (req, res) => {
    res.json(await tanks.get(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/', allow('tanks.write'), async (req, res) => {
    res.status(201).json(await tanks.create(actorOf(req), parse(tankInputSchema, req, 'body')))
  })
  router.patch('/:id', allow('tanks.write'), async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    res.json(await tanks.update(actorOf(req), id, parseChanges(tankUpdateSchema, req)))
  })
  router.post('/:id/duplicate', allow('tanks.write'), async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    const { count } = parse(tankDuplicateSchema, req, 'body')
    res.status(201).json(await duplicateTank(ctx, actorOf(req), id, count))
  })
  router.post('/:id/archive', allow('tanks.archive'), async (req, res) => {
    res.json(await tanks.setArchived(actorOf(req), parse(idParamsSchema, req, 'params').id, true))
  })
  router.post('/:id/unarchive', allow('tanks.archive'), async (req, res) => {
    res.json(await tanks.setArchived(actorOf(req), parse(idParamsSchema, req, 'params').id, false))
  })
  return router
}
