import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { deviceInputSchema, deviceListQuerySchema, deviceUpdateSchema } from '@shared/schemas/devices'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { devicesService } from './devices'

export function devicesRouter(ctx: AppContext) {
  const router = Router()
  const devices = devicesService(ctx)
  const id = (req: Parameters<typeof parse>[1]) => parse(idParamsSchema, req, 'params').id

  router.get('/', allow('org.read'), async (req, res) => {
    res.json(await devices.list(actorOf(req), parse(deviceListQuerySchema, req, 'query').tankId))
  })
  router.get('/:id', allow('org.read'), async (req, res) => {
    res.json(await devices.get(actorOf(req), id(req)))
  })
  router.post('/', allow('devices.manage'), async (req, res) => {
    res.status(201).json(await devices.create(actorOf(req), parse(deviceInputSchema, req, 'body')))
  })
  router.patch('/:id', allow('devices.manage'), async (req, res) => {
    res.json(await devices.update(actorOf(req), id(req), parse(deviceUpdateSchema, req, 'body')))
  })
  router.post('/:id/rotate', allow('devices.manage'), async (req, res) => {
    res.json(await devices.rotate(actorOf(req), id(req)))
  })
  router.post('/:id/revoke', allow('devices.manage'), async (req, res) => {
    res.json(await devices.revoke(actorOf(req), id(req)))
  })
  return router
}
