import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { alertChannelsSchema, pushSubscriptionBodySchema } from '@shared/schemas/push'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { pushDevicesService } from './devices'

/** A person's own notification devices and alert channels (mounted at /push). */
export function pushRouter(ctx: AppContext) {
  const router = Router()
  const devices = pushDevicesService(ctx)
  router.use(allow('account.alerts'))
  const id = (req: Parameters<typeof parse>[1]) => parse(idParamsSchema, req, 'params').id

  router.get('/config', (_req, res) => {
    res.json(devices.config())
  })
  router.get('/subscriptions', async (req, res) => {
    res.json(await devices.list(actorOf(req)))
  })
  router.post('/subscriptions', async (req, res) => {
    res.status(201).json(await devices.subscribe(actorOf(req), parse(pushSubscriptionBodySchema, req, 'body')))
  })
  router.delete('/subscriptions/:id', async (req, res) => {
    await devices.remove(actorOf(req), id(req))
    res.status(204).end()
  })
  router.post('/subscriptions/:id/test', async (req, res) => {
    res.status(202).json(await devices.test(actorOf(req), id(req)))
  })
  router.get('/channels', async (req, res) => {
    res.json(await devices.channels(actorOf(req)))
  })
  router.put('/channels', async (req, res) => {
    res.json(await devices.setChannels(actorOf(req), parse(alertChannelsSchema, req, 'body')))
  })
  return router
}
