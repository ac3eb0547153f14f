import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { consumableInputSchema, consumableUpdateSchema, equipmentInputSchema, equipmentReplaceSchema, equipmentUpdateSchema } from '@shared/schemas/equipment'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { consumablesService } from './consumables'
import { equipmentService } from './equipment'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id

/** Mounted under /tanks: a tank's equipment. */
export function tankEquipmentRoutes(ctx: AppContext) {
  const router = Router()
  const equipment = equipmentService(ctx)
  router.get('/:id/equipment', allow('org.read'), async (req, res) => {
    res.json(await equipment.list(actorOf(req), id(req)))
  })
  router.post('/:id/equipment', allow('care.write'), async (req, res) => {
    res.status(201).json(await equipment.create(actorOf(req), id(req), parse(equipmentInputSchema, req, 'body')))
  })
  return router
}

/** Mounted under /sites: a site's consumables. */
export function siteConsumableRoutes(ctx: AppContext) {
  const router = Router()
  const consumables = consumablesService(ctx)
  router.get('/:id/consumables', allow('org.read'), async (req, res) => {
    res.json(await consumables.list(actorOf(req), id(req)))
  })
  router.post('/:id/consumables', allow('care.write'), async (req, res) => {
    res.status(201).json(await consumables.create(actorOf(req), id(req), parse(consumableInputSchema, req, 'body')))
  })
  return router
}

/** Mounted at /equipment and /consumables: one piece or one stock by its id. */
export function equipmentRouter(ctx: AppContext) {
  const router = Router()
  const equipment = equipmentService(ctx)
  router.patch('/:id', allow('care.write'), async (req, res) => {
    res.json(await equipment.update(actorOf(req), id(req), parseChanges(equipmentUpdateSchema, req)))
  })
  router.post('/:id/replace', allow('care.write'), async (req, res) => {
    res.json(await equipment.replace(actorOf(req), id(req), parse(equipmentReplaceSchema, req, 'body')))
  })
  return router
}

export function consumablesRouter(ctx: AppContext) {
  const router = Router()
  const consumables = consumablesService(ctx)
  router.patch('/:id', allow('care.write'), async (req, res) => {
    res.json(await consumables.update(actorOf(req), id(req), parseChanges(consumableUpdateSchema, req)))
  })
  return router
}
