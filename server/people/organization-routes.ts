import { Router } from 'express'
import { organizationSettingsSchema } from '@shared/schemas/auth'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { organizationService } from './organization'

export function organizationRouter(ctx: AppContext) {
  const router = Router()
  router.patch('/', allow('org.settings'), async (req, res) => {
    res.json(await organizationService(ctx).update(actorOf(req), parse(organizationSettingsSchema, req, 'body')))
  })
  return router
}
