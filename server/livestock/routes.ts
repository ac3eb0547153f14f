import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { batchListQuerySchema, batchLossSchema, batchMoveSchema, batchOutSchema, stockQuerySchema } from '@shared/schemas/livestock'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { batchMovesService } from './batch-moves'
import { batchesService } from './batches'
import { stockService } from './stock'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id

/** Mounted at /livestock: batches, their moves, losses and outcomes, and stock counts. */
export function livestockRouter(ctx: AppContext) {
  const router = Router()
  const batches = batchesService(ctx)
  const moves = batchMovesService(ctx)
  const stock = stockService(ctx)

  router.get('/batches', allow('org.read'), async (req, res) => {
    res.json(await batches.list(actorOf(req), parse(batchListQuerySchema, req, 'query')))
  })
  router.get('/batches/:id', allow('org.read'), async (req, res) => {
    res.json(await batches.get(actorOf(req), id(req)))
  })
  router.post('/batches/:id/move', allow('care.write'), async (req, res) => {
    res.json(await moves.move(actorOf(req), id(req), parse(batchMoveSchema, req, 'body')))
  })
  router.post('/batches/:id/losses', allow('care.write'), async (req, res) => {
    res.json(await moves.lose(actorOf(req), id(req), parse(batchLossSchema, req, 'body')))
  })
  router.post('/batches/:id/out', allow('care.write'), async (req, res) => {
    res.json(await moves.out(actorOf(req), id(req), parse(batchOutSchema, req, 'body')))
  })
  router.get('/stock', allow('org.read'), async (req, res) => {
    res.json(await stock.counts(actorOf(req), parse(stockQuerySchema, req, 'query')))
  })
  router.get('/stock.csv', allow('org.read'), async (req, res) => {
    const { fileName, body } = await stock.csv(actorOf(req), parse(stockQuerySchema, req, 'query'))
    res.attachment(fileName).type('text/csv; charset=utf-8')
    res.send(body)
  })
  return router
}
