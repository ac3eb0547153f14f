import { Router, type Request } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import {
  backupInputSchema,
  onDutyQuerySchema,
  overrideInputSchema,
  overrideListQuerySchema,
  overrideParamsSchema,
  rosterWeekQuerySchema,
  shiftInputSchema,
  shiftParamsSchema,
  shiftUpdateSchema,
} from '@shared/schemas/roster'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { rosterService } from './roster'

/** The duty roster of one site; mounted under /sites, beside the sites router. */
export function rosterRoutes(ctx: AppContext) {
  const router = Router()
  const roster = rosterService(ctx)
  const siteId = (req: Request) => parse(idParamsSchema, req, 'params').id

  router.get('/:id/roster/shifts', allow('org.read'), async (req, res) => {
    res.json(await roster.listShifts(actorOf(req), siteId(req)))
  })
  router.post('/:id/roster/shifts', allow('roster.manage'), async (req, res) => {
    res.status(201).json(await roster.createShift(actorOf(req), siteId(req), parse(shiftInputSchema, req, 'body')))
  })
  router.patch('/:id/roster/shifts/:shiftId', allow('roster.manage'), async (req, res) => {
    const { id, shiftId } = parse(shiftParamsSchema, req, 'params')
    res.json(await roster.updateShift(actorOf(req), id, shiftId, parseChanges(shiftUpdateSchema, req)))
  })
  router.delete('/:id/roster/shifts/:shiftId', allow('roster.manage'), async (req, res) => {
    const { id, shiftId } = parse(shiftParamsSchema, req, 'params')
    await roster.deleteShift(actorOf(req), id, shiftId)
    res.status(204).end()
  })

  router.get('/:id/roster/overrides', allow('org.read'), async (req, res) => {
    res.json(await roster.listOverrides(actorOf(req), siteId(req), parse(overrideListQuerySchema, req, 'query')))
  })
  router.post('/:id/roster/overrides', allow('roster.manage'), async (req, res) => {
    res.status(201).json(await roster.createOverride(actorOf(req), siteId(req), parse(overrideInputSchema, req, 'body')))
  })
  router.delete('/:id/roster/overrides/:overrideId', allow('roster.manage'), async (req, res) => {
    const { id, overrideId } = parse(overrideParamsSchema, req, 'params')
    await roster.deleteOverride(actorOf(req), id, overrideId)
    res.status(204).end()
  })

  router.get('/:id/roster/on-duty', allow('org.read'), async (req, res) => {
    const { at } = parse(onDutyQuerySchema, req, 'query')
    res.json(await roster.onDutyNow(actorOf(req), siteId(req), at ? new Date(at) : new Date()))
  })
  router.get('/:id/roster/week', allow('org.read'), async (req, res) => {
    res.json(await roster.week(actorOf(req), siteId(req), parse(rosterWeekQuerySchema, req, 'query').start))
  })
  router.put('/:id/roster/backup', allow('roster.manage'), async (req, res) => {
    res.json(await roster.setBackup(actorOf(req), siteId(req), parse(backupInputSchema, req, 'body').userId))
  })
  return router
}
