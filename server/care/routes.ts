import { Router, type Request } from 'express'
import { z } from 'zod'
import { idParamsSchema, idSchema } from '@shared/schemas/common'
import {
  careLogInputSchema,
  careLogQuerySchema,
  careTaskDoneSchema,
  careTaskInputSchema,
  careTasksDoneSchema,
  careTaskSnoozeSchema,
  careTaskUpdateSchema,
  careTodayQuerySchema,
  livestockInputSchema,
  livestockUpdateSchema,
  waterChangeCancelSchema,
  waterChangeFinishSchema,
  waterChangePlanSchema,
  waterChangeStartSchema,
} from '@shared/schemas/care'
import { SPECIES } from '@shared/care/species'
import { treatmentCourseInputSchema } from '@shared/schemas/treatment'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse, parseChanges } from '../platform/http/validate'
import { careLogService } from './care-log'
import { livestockService } from './livestock'
import { careTasksService } from './care-tasks'
import { waterChangesService } from './water-changes'
import { treatmentCoursesService } from './treatment-courses'

const id = (req: Request) => parse(idParamsSchema, req, 'params').id
const entryParams = z.object({ id: idSchema, entryId: idSchema })

/** Mounted under /tanks: a tank's care tasks, care log, water changes, livestock, cycling and treatment courses. */
export function careRoutes(ctx: AppContext) {
  const router = Router()
  const tasks = careTasksService(ctx)
  const log = careLogService(ctx)
  const changes = waterChangesService(ctx)
  const livestock = livestockService(ctx)
  const courses = treatmentCoursesService(ctx)

  router.get('/:id/care-tasks', allow('org.read'), async (req, res) => {
    res.json(await tasks.listForTank(actorOf(req), id(req)))
  })
  router.post('/:id/care-tasks', allow('care.manage'), async (req, res) => {
    res.status(201).json(await tasks.create(actorOf(req), id(req), parse(careTaskInputSchema, req, 'body')))
  })
  router.get('/:id/care-log', allow('org.read'), async (req, res) => {
    res.json(await log.list(actorOf(req), id(req), parse(careLogQuerySchema, req, 'query')))
  })
  router.post('/:id/care-log', allow('care.write'), async (req, res) => {
    res.status(201).json(await log.create(actorOf(req), id(req), parse(careLogInputSchema, req, 'body')))
  })
  router.get('/:id/water-changes', allow('org.read'), async (req, res) => {
    res.json(await changes.list(actorOf(req), id(req)))
  })
  // A plan writes nothing, so anyone who can see the tank may work one out.
  router.post('/:id/water-changes/plan', allow('org.read'), async (req, res) => {
    res.json(await changes.plan(actorOf(req), id(req), parse(waterChangePlanSchema, req, 'body')))
  })
  router.post('/:id/water-changes', allow('care.write'), async (req, res) => {
    res.status(201).json(await changes.start(actorOf(req), id(req), parse(waterChangeStartSchema, req, 'body')))
  })
  router.get('/:id/livestock', allow('org.read'), async (req, res) => {
    res.json(await livestock.list(actorOf(req), id(req)))
  })
  router.post('/:id/livestock', allow('care.write'), async (req, res) => {
    res.status(201).json(await livestock.add(actorOf(req), id(req), parse(livestockInputSchema, req, 'body')))
  })
  router.patch('/:id/livestock/:entryId', allow('care.write'), async (req, res) => {
    const p = parse(entryParams, req, 'params')
    res.json(await livestock.update(actorOf(req), p.id, p.entryId, parseChanges(livestockUpdateSchema, req)))
  })
  router.get('/:id/cycling', allow('org.read'), async (req, res) => {
    res.json(await livestock.cycling(actorOf(req), id(req)))
  })
  router.get('/:id/treatment-courses', allow('org.read'), async (req, res) => {
    res.json(await courses.list(actorOf(req), id(req)))
  })
  router.post('/:id/treatment-courses', allow('care.write'), async (req, res) => {
    res.status(201).json(await courses.start(actorOf(req), id(req), parse(treatmentCourseInputSchema, req, 'body')))
  })
  return router
}

/** Mounted at the API root: /care-tasks/done, /care-tasks/:id…, /water-changes/:id/finish|cancel, /treatment-courses/:id/stop, /care/today, /care/species. */
export function careRouter(ctx: AppContext) {
  const router = Router()
  const tasks = careTasksService(ctx)
  const changes = waterChangesService(ctx)

  router.patch('/care-tasks/:id', allow('care.manage'), async (req, res) => {
    res.json(await tasks.update(actorOf(req), id(req), parseChanges(careTaskUpdateSchema, req)))
  })
  router.post('/care-tasks/done', allow('care.write'), async (req, res) => {
    res.json(await tasks.markManyDone(actorOf(req), parse(careTasksDoneSchema, req, 'body')))
  })
  router.post('/care-tasks/:id/done', allow('care.write'), async (req, res) => {
    res.json(await tasks.markDone(actorOf(req), id(req), parse(careTaskDoneSchema, req, 'body')))
  })
  router.post('/care-tasks/:id/snooze', allow('care.write'), async (req, res) => {
    res.json(await tasks.snooze(actorOf(req), id(req), parse(careTaskSnoozeSchema, req, 'body')))
  })
  router.post('/water-changes/:id/finish', allow('care.write'), async (req, res) => {
    res.json(await changes.finish(actorOf(req), id(req), parse(waterChangeFinishSchema, req, 'body')))
  })
  router.post('/water-changes/:id/cancel', allow('care.write'), async (req, res) => {
    res.json(await changes.cancel(actorOf(req), id(req), parse(waterChangeCancelSchema, req, 'body')))
  })
  router.post('/treatment-courses/:id/stop', allow('care.write'), async (req, res) => {
    res.json(await treatmentCoursesService(ctx).stop(actorOf(req), id(req)))
  })
  router.get('/care/today', allow('org.read'), async (req, res) => {
    res.json(await tasks.today(actorOf(req), parse(careTodayQuerySchema, req, 'query')))
  })
  router.get('/care/species', allow('org.read'), (_req, res) => {
    res.json(SPECIES)
  })
  return router
}

/** Mounted under /sites: the overdue and due-today counts of a site's care tasks. */
export function siteCareRoutes(ctx: AppContext) {
  const router = Router()
  const tasks = careTasksService(ctx)
  router.get('/:id/care-summary', allow('org.read'), async (req, res) => {
    res.json(await tasks.siteSummary(actorOf(req), id(req)))
  })
  return router
}
