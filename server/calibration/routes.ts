import { Router } from 'express'
import { idParamsSchema } from '@shared/schemas/common'
import { calibrationInputSchema } from '@shared/schemas/calibrations'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { calibrationsService } from './calibrations'

/** Mounted under /devices: a device's calibrations. */
export function deviceCalibrationRoutes(ctx: AppContext) {
  const router = Router()
  const calibrations = calibrationsService(ctx)
  router.get('/:id/calibrations', allow('org.read'), async (req, res) => {
    res.json(await calibrations.list(actorOf(req), parse(idParamsSchema, req, 'params').id))
  })
  router.post('/:id/calibrations', allow('care.write'), async (req, res) => {
    const id = parse(idParamsSchema, req, 'params').id
    res.status(201).json(await calibrations.record(actorOf(req), id, parse(calibrationInputSchema, req, 'body')))
  })
  return router
}
