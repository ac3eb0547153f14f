import { Router } from 'express'
import { z } from 'zod'
import { idParamsSchema } from '@shared/schemas/common'
import { testKitEntryInputSchema } from '@shared/schemas/test-kit'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { testKitService } from './test-kit'
import { instantSchema } from '@shared/schemas/time'

const rangeSchema = z.object({
  from: instantSchema.optional(),
  to: instantSchema.optional(),
})

/** Mounted under /tanks: the entries of one tank. */
export function tankTestKitRoutes(ctx: AppContext) {
  const router = Router()
  const kit = testKitService(ctx)
  router.get('/:id/test-kit-entries', allow('org.read'), async (req, res) => {
    const { from, to } = parse(rangeSchema, req, 'query')
    const id = parse(idParamsSchema, req, 'params').id
    res.json(await kit.list(actorOf(req), id, { from: from ? new Date(from) : undefined, to: to ? new Date(to) : undefined }))
  })
  router.post('/:id/test-kit-entries', allow('kit.write'), async (req, res) => {
    const id = parse(idParamsSchema, req, 'params').id
    res.status(201).json(await kit.create(actorOf(req), id, parse(testKitEntryInputSchema, req, 'body')))
  })
  return router
}

/** /test-kit-entries/:id — one entry: its history, and edits by its author within the window. */
export function testKitEntriesRouter(ctx: AppContext) {
  const router = Router()
  const kit = testKitService(ctx)
  router.get('/:id/history', allow('org.read'), async (req, res) => {
    res.json(await kit.history(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.put('/:id', allow('kit.write'), async (req, res) => {
    const id = parse(idParamsSchema, req, 'params').id
    res.json(await kit.update(actorOf(req), id, parse(testKitEntryInputSchema, req, 'body')))
  })
  router.delete('/:id', allow('kit.write'), async (req, res) => {
    await kit.remove(actorOf(req), parse(idParamsSchema, req, 'params').id)
    res.status(204).end()
  })
  return router
}
