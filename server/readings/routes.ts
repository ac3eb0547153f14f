import { Router } from 'express'
import type { AppContext } from '../context'
import { AppError } from '../platform/errors'
import { BufferFullError, DatabaseUnavailableError } from './batch-writer'
import { MalformedMessageError } from './ingest'

/** `POST /api/v1/readings` with a device token: the HTTP face of the ingest path. */
export function readingsRouter(ctx: AppContext) {
  const router = Router()
  router.post('/', async (req, res) => {
    try {
      res.json(await ctx.readings.ingest.fromDevice(req.device!, req.body, { hold: false }))
    } catch (error) {
      if (error instanceof MalformedMessageError) throw new AppError(400, 'invalid_message', error.message, { [error.field]: error.problem })
      if (error instanceof DatabaseUnavailableError || error instanceof BufferFullError) {
        throw new AppError(503, 'unavailable', 'Readings cannot be stored right now; send them again later', undefined, 5)
      }
      throw error
    }
  })
  return router
}
