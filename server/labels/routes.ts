import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { labelSheetQuerySchema } from '@shared/schemas/labels'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { labelsService } from './labels'

/** Mounted under /sites: GET /:id/labels.pdf?paper=a4|letter&size=small|large. */
export function siteLabelRoutes(ctx: AppContext) {
  const router = Router()
  const labels = labelsService(ctx)
  router.get('/:id/labels.pdf', allow('labels.print'), async (req, res) => {
    const id = parse(idParamsSchema, req, 'params').id
    const sheet = await labels.sheet(actorOf(req), id, parse(labelSheetQuerySchema, req, 'query'))
    res.type('application/pdf').set('Content-Disposition', `attachment; filename="${sheet.fileName}"`).send(sheet.pdf)
  })
  return router
}
