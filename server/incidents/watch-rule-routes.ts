import { Router } from 'express'
import { idParamsSchema, idSchema } from '@shared/schemas/common'
import { z } from 'zod'
import { ruleInputSchema, ruleUpdateSchema, snoozeInputSchema } from '@shared/schemas/rules'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { rulesService } from './watch-rules'
import { snoozesService } from './snoozes'

const overrideParams = z.object({ id: idSchema, ruleId: idSchema })

/** Mounted under /tanks: a tank's rules (its own and the site's) and its snoozes. */
export function tankRulesRoutes(ctx: AppContext, status?: (ruleId: number, tankId: number) => 'clear' | 'holding' | 'tripped' | undefined) {
  const router = Router()
  const rules = rulesService(ctx)
  const snoozes = snoozesService(ctx)
  const id = (req: Parameters<typeof parse>[1]) => parse(idParamsSchema, req, 'params').id
  router.get('/:id/rules', allow('org.read'), async (req, res) => {
    const tankId = id(req)
    res.json(await rules.listForTank(actorOf(req), tankId, status ? (ruleId) => status(ruleId, tankId) : undefined))
  })
  router.post('/:id/rules', allow('rules.manage'), async (req, res) => {
    res.status(201).json(await rules.createForTank(actorOf(req), id(req), parse(ruleInputSchema, req, 'body')))
  })
  router.put('/:id/rules/:ruleId/override', allow('rules.manage'), async (req, res) => {
    const p = parse(overrideParams, req, 'params')
    res.json(await rules.overrideForTank(actorOf(req), p.id, p.ruleId, parseChanges(ruleUpdateSchema, req)))
  })
  router.get('/:id/snoozes', allow('org.read'), async (req, res) => {
    res.json(await snoozes.list(actorOf(req), id(req)))
  })
  router.post('/:id/snoozes', allow('snoozes.write'), async (req, res) => {
    res.status(201).json(await snoozes.create(actorOf(req), id(req), parse(snoozeInputSchema, req, 'body')))
  })
  return router
}

/** Mounted under /sites: site-wide rules. */
export function siteRulesRoutes(ctx: AppContext) {
  const router = Router()
  const rules = rulesService(ctx)
  router.get('/:id/rules', allow('org.read'), async (req, res) => {
    res.json(await rules.listForSite(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/:id/rules', allow('rules.manage'), async (req, res) => {
    res.status(201).json(await rules.createForSite(actorOf(req), parse(idParamsSchema, req, 'params').id, parse(ruleInputSchema, req, 'body')))
  })
  return router
}

/** /rules/:id and /snoozes/:id */
export function rulesRouter(ctx: AppContext) {
  const router = Router()
  const rules = rulesService(ctx)
  router.patch('/:id', allow('rules.manage'), async (req, res) => {
    res.json(await rules.update(actorOf(req), parse(idParamsSchema, req, 'params').id, parseChanges(ruleUpdateSchema, req)))
  })
  router.delete('/:id', allow('rules.manage'), async (req, res) => {
    await rules.remove(actorOf(req), parse(idParamsSchema, req, 'params').id)
    res.status(204).end()
  })
  return router
}

export function snoozesRouter(ctx: AppContext) {
  const router = Router()
  router.post('/:id/cancel', allow('snoozes.write'), async (req, res) => {
    res.json(await snoozesService(ctx).cancel(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  return router
}
