import { Router } from 'express'
import { z } from 'zod'
import { acceptInviteSchema } from '@shared/schemas/auth'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { usersService } from './users'

/** The invitee has no account yet: these routes are open, guarded by the secret token alone. */
export function invitationsRouter(ctx: AppContext) {
  const router = Router()
  const users = usersService(ctx)

  router.get('/:token', async (req, res) => {
    // No minimum length: a truncated link is an unknown invitation (404), not a malformed request.
    const { token } = parse(z.object({ token: z.string().max(200) }), req, 'params')
    res.json(await users.describeInvitation(token))
  })

  router.post('/accept', async (req, res) => {
    const { token, password, name } = parse(acceptInviteSchema, req, 'body')
    res.status(201).json(await users.acceptInvitation(token, password, name))
  })

  return router
}
