import bcrypt from 'bcryptjs'
import { Op } from 'sequelize'
import type { SessionInfo } from '@shared/schemas/auth'
import type { UserActor } from '../access/actor'
import { signAccessToken } from '../access/tokens'
import type { AppContext } from '../context'
import { AppError, badRequest, notFound } from '../platform/errors'
import type { User } from '../models'
import { presentOrganization, presentUser } from './present-user'
import { perContext } from '../platform/per-context'

// Compared against when the e-mail is unknown, so both failures take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', 10)

export const authService = perContext((ctx: AppContext) => {
  const { models, config } = ctx

  async function loadUser(where: { id: number } | { email: string }) {
    return models.User.findOne({ where, include: [{ association: 'sites', attributes: ['id'] }] })
  }

  async function openSession(user: User): Promise<SessionInfo> {
    const { token, jti, expiresAt } = signAccessToken(config.jwtSecret, { userId: user.id, organizationId: user.organizationId }, config.accessTokenHours)
    await models.Session.create({ id: jti, userId: user.id, expiresAt })
    const organization = await models.Organization.findByPk(user.organizationId)
    return {
      token,
      expiresAt: expiresAt.toISOString(),
      user: presentUser(user),
      organization: presentOrganization(user.organizationId, organization),
    }
  }

  return {
    openSession,

    async hashPassword(password: string) {
      return bcrypt.hash(password, config.bcryptRounds)
    },

    async signIn(email: string, password: string): Promise<SessionInfo> {
      const user = await loadUser({ email: email.toLowerCase() })
      const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH)
      if (!user || !ok || !user.active) {
        throw new AppError(401, 'bad_credentials', 'E-mail or password is not right')
      }
      return openSession(user)
    },

    async signOut(actor: UserActor) {
      await models.Session.update({ revokedAt: new Date() }, { where: { id: actor.sessionId } })
    },

    async me(actor: UserActor) {
      const user = await loadUser({ id: actor.userId })
      if (!user) throw notFound('User not found')
      const organization = await models.Organization.findByPk(actor.organizationId)
      return { user: presentUser(user), organization: presentOrganization(actor.organizationId, organization) }
    },

    async changePassword(actor: UserActor, currentPassword: string, newPassword: string) {
      const user = await models.User.findByPk(actor.userId)
      if (!user) throw notFound('User not found')
      if (!(await bcrypt.compare(currentPassword, user.passwordHash))) {
        throw badRequest('The current password is not right', { currentPassword: 'not right' })
      }
      user.passwordHash = await bcrypt.hash(newPassword, config.bcryptRounds)
      await user.save()
      // Every other session of this user ends; the current one stays signed in.
      await models.Session.update({ revokedAt: new Date() }, { where: { userId: user.id, revokedAt: null, id: { [Op.ne]: actor.sessionId } } })
    },
  }
})
