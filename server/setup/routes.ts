import { Router, type Request } from 'express'
import { rateLimit, ipKeyGenerator } from 'express-rate-limit'
import { checklistStepSchema, setupInputSchema } from '@shared/schemas/setup'
import { actorOf, allow, type authenticate } from '../access/middleware'
import type { AppContext } from '../context'
import { AppError } from '../platform/errors'
import { parse } from '../platform/http/validate'
import { checklistService } from './checklist'
import { setupService } from './setup'

export function setupRouter(ctx: AppContext, requireUser: ReturnType<typeof authenticate>) {
  const router = Router()
  const setup = setupService(ctx)
  const checklist = checklistService(ctx)
  const windowMs = ctx.config.signInWindowMinutes * 60_000

  /**
   * The caller's address as far as the server can tell. A request relayed by a proxy that
   * TRUST_PROXY does not name carries the proxy's address, which may be loopback: it is no
   * proof of being on this machine, so it counts as from elsewhere.
   */
  const callerAddress = (req: Request) => (!ctx.config.trustProxy && (req.headers['x-forwarded-for'] || req.headers.forwarded) ? undefined : req.ip)

  // Guessing the setup code: a few tries per address and window, like sign-in.
  const limiter = rateLimit({
    windowMs,
    limit: ctx.config.signInLimit,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    keyGenerator: (req) => `setup|${ipKeyGenerator(req.ip ?? '')}`,
    validate: { xForwardedForHeader: false },
    handler: (req, _res, next) => {
      const resetTime = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime
      const retry = Math.max(1, Math.ceil(((resetTime?.getTime() ?? Date.now() + windowMs) - Date.now()) / 1000))
      next(new AppError(429, 'rate_limited', `Too many setup attempts; try again in ${retry} s`, undefined, retry))
    },
  })

  router.get('/', async (req, res) => {
    res.json(await setup.state(callerAddress(req)))
  })
  router.post('/', limiter, async (req, res) => {
    const input = parse(setupInputSchema, req, 'body')
    res.status(201).json(await setup.run(input, callerAddress(req)))
  })

  router.get('/checklist', requireUser, allow('org.setup'), async (req, res) => {
    res.json(await checklist.forOwner(actorOf(req)))
  })
  router.post('/checklist/:step/dismiss', requireUser, allow('org.setup'), async (req, res) => {
    await checklist.dismiss(actorOf(req), parse(checklistStepSchema, req, 'params').step)
    res.status(204).end()
  })
  return router
}
