import { Router } from 'express'
import { inviteSchema, updateUserSchema } from '@shared/schemas/auth'
import { idParamsSchema } from '@shared/schemas/common'
import { actorOf, allow } from '../access/middleware'
import type { AppContext } from '../context'
import { parse } from '../platform/http/validate'
import { usersService } from './users'

export function usersRouter(ctx: AppContext) {
  const router = Router()
  const users = usersService(ctx)
  router.use(allow('users.manage'))

  router.get('/', async (req, res) => {
    res.json(await users.list(actorOf(req)))
  })
  router.get('/invitations', async (req, res) => {
    res.json(await users.listInvitations(actorOf(req)))
  })
  router.post('/invitations', async (req, res) => {
    res.status(201).json(await users.invite(actorOf(req), parse(inviteSchema, req, 'body')))
  })
  router.delete('/invitations/:id', async (req, res) => {
    await users.revokeInvitation(actorOf(req), parse(idParamsSchema, req, 'params').id)
    res.status(204).end()
  })
  router.patch('/:id', async (req, res) => {
    const { id } = parse(idParamsSchema, req, 'params')
    res.json(await users.update(actorOf(req), id, parse(updateUserSchema, req, 'body')))
  })
  return router
}
