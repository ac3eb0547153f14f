import { Router, type NextFunction, type Request, type RequestHandler, type Response } from 'express'
import { rateLimit, ipKeyGenerator } from 'express-rate-limit'
import { changePasswordSchema, passwordResetConfirmSchema, passwordResetRequestSchema, signInSchema } from '@shared/schemas/auth'
import { actorOf, type authenticate } from '../access/middleware'
import type { AppContext } from '../context'
import { AppError } from '../platform/errors'
import { parse } from '../platform/http/validate'
import { authService } from './auth'
import { passwordResetService } from './password-reset'

/** How many addresses' worth of attempts one e-mail address gets in a window. */
export const ACCOUNT_LIMIT_FACTOR = 5

export function authRouter(ctx: AppContext, requireUser: ReturnType<typeof authenticate>) {
  const router = Router()
  const auth = authService(ctx)
  const windowMs = ctx.config.signInWindowMinutes * 60_000

  const rateLimited = (req: Request, _res: Response, next: NextFunction) => {
    const resetTime = (req as { rateLimit?: { resetTime?: Date } }).rateLimit?.resetTime
    const retry = Math.max(1, Math.ceil(((resetTime?.getTime() ?? Date.now() + windowMs) - Date.now()) / 1000))
    next(new AppError(429, 'rate_limited', `Too many sign-in attempts; try again in ${retry} s`, undefined, retry))
  }
  // Runs before validation: normalised like the e-mail schema (trim, lower case) so padding opens no fresh
  // allowance, and a non-string e-mail (an object whose toString is not a function) must not throw.
  const emailOf = (req: Request) => (typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '')
  const limiterOptions = {
    windowMs,
    standardHeaders: 'draft-7' as const,
    legacyHeaders: false,
    handler: rateLimited,
    // req.ip honours X-Forwarded-For only from TRUST_PROXY's proxies; a stray header is expected, not a misconfiguration.
    validate: { xForwardedForHeader: false },
  }
  // Counted per address and e-mail, so one person cannot lock out the whole shop behind one router…
  const perAddress = rateLimit({ ...limiterOptions, limit: ctx.config.signInLimit, keyGenerator: (req) => `${ipKeyGenerator(req.ip ?? '')}|${emailOf(req)}` })
  // …and per e-mail from every address together, so new addresses buy a guesser at most a few more allowances.
  const perAccount = rateLimit({ ...limiterOptions, limit: ctx.config.signInLimit * ACCOUNT_LIMIT_FACTOR, keyGenerator: (req) => `account|${emailOf(req)}` })
  const signInLimiter: RequestHandler[] = [perAccount, perAddress]

  router.post('/sign-in', ...signInLimiter, async (req, res) => {
    const { email, password } = parse(signInSchema, req, 'body')
    res.json(await auth.signIn(email, password))
  })

  router.post('/sign-out', requireUser, async (req, res) => {
    await auth.signOut(actorOf(req))
    res.status(204).end()
  })

  router.get('/me', requireUser, async (req, res) => {
    res.json(await auth.me(actorOf(req)))
  })

  router.post('/password', requireUser, async (req, res) => {
    const { currentPassword, newPassword } = parse(changePasswordSchema, req, 'body')
    await auth.changePassword(actorOf(req), currentPassword, newPassword)
    res.status(204).end()
  })

  // Same answer whether or not the address is known; rate-limited like sign-in.
  router.post('/password-reset', ...signInLimiter, async (req, res) => {
    await passwordResetService(ctx).request(parse(passwordResetRequestSchema, req, 'body').email)
    res.status(202).json({ message: 'If that address belongs to an active account, a reset link is on its way' })
  })
  router.post('/password-reset/confirm', async (req, res) => {
    const { token, password } = parse(passwordResetConfirmSchema, req, 'body')
    await passwordResetService(ctx).confirm(token, password)
    res.status(204).end()
  })

  return router
}
