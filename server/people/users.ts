import { Op } from 'sequelize'
import type { InviteInput, UserChanges } from '@shared/schemas/auth'
import type { UserActor } from '../access/actor'
import { hashSecret, newSecretToken } from '../access/tokens'
import type { AppContext } from '../context'
import { badRequest, conflict, notFound } from '../platform/errors'
import { authService } from './auth'
import { enqueueMail } from '../mail'
import { invitation as invitationMail } from '../mail'
import { perContext } from '../platform/per-context'
import { presentUser } from './present-user'

const INVITATION_DAYS = 7

export const usersService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx
  const auth = authService(ctx)
  const include = [{ association: 'sites', attributes: ['id'] }]

  async function assertSitesInOrganization(organizationId: number, siteIds: number[]) {
    if (!siteIds.length) return
    const found = await models.Site.count({ where: { id: siteIds, organizationId } })
    if (found !== new Set(siteIds).size) throw badRequest('siteIds: unknown site', { siteIds: 'unknown site' })
  }

  function publicInvitation(inv: InstanceType<typeof models.Invitation>) {
    return {
      id: inv.id,
      email: inv.email,
      name: inv.name,
      role: inv.role,
      siteIds: inv.siteIds,
      clientId: inv.clientId ?? null,
      expiresAt: inv.expiresAt.toISOString(),
      createdAt: inv.createdAt.toISOString(),
    }
  }

  async function pendingInvitation(token: string) {
    const inv = await models.Invitation.findOne({ where: { tokenHash: hashSecret(token) } })
    if (!inv || inv.acceptedAt || inv.expiresAt.getTime() <= Date.now()) {
      throw notFound('This invitation is unknown, already used or expired')
    }
    return inv
  }

  return {
    async list(actor: UserActor) {
      const users = await models.User.findAll({
        where: { organizationId: actor.organizationId },
        include,
        order: [['name', 'ASC']],
      })
      return users.map(presentUser)
    },

    async update(actor: UserActor, id: number, changes: UserChanges) {
      const updated = await sequelize.transaction(async (transaction) => {
        // Lock the organization's owners so two owners demoting each other cannot both succeed.
        const owners = await models.User.findAll({
          where: { organizationId: actor.organizationId, role: 'owner', active: true },
          lock: transaction.LOCK.UPDATE,
          transaction,
        })
        const user = await models.User.findOne({ where: { id, organizationId: actor.organizationId }, transaction })
        if (!user) throw notFound('User not found')
        const losesOwner = user.role === 'owner' && user.active && ((changes.role && changes.role !== 'owner') || changes.active === false)
        if (losesOwner && owners.length <= 1) {
          throw conflict('last_owner', 'The organization must keep at least one active owner')
        }
        if (changes.siteIds) await assertSitesInOrganization(actor.organizationId, changes.siteIds)
        const { siteIds, ...fields } = changes
        const roleChanged = changes.role !== undefined && changes.role !== user.role
        // A client's person is a viewer; any other role is staff and no longer speaks for the client.
        await user.update({ ...fields, ...(fields.role && fields.role !== 'viewer' ? { clientId: null } : {}) }, { transaction })
        if (siteIds) {
          await models.UserSite.destroy({ where: { userId: user.id }, transaction })
          await models.UserSite.bulkCreate(
            siteIds.map((siteId) => ({ userId: user.id, siteId })),
            { transaction },
          )
        }
        if (changes.active === false || roleChanged) {
          // A deactivated user or a changed role takes effect at once: their sessions end.
          await models.Session.update({ revokedAt: new Date() }, { where: { userId: user.id, revokedAt: null }, transaction })
        }
        await user.reload({ include, transaction })
        return presentUser(user)
      })
      // Open live sockets are checked against the new scope at once (a changed role or status also ends the sessions).
      if (changes.siteIds || changes.role !== undefined || changes.active !== undefined) {
        ctx.events.emit('access.changed', { organizationId: actor.organizationId })
      }
      return updated
    },

    async listInvitations(actor: UserActor) {
      const rows = await models.Invitation.findAll({
        where: { organizationId: actor.organizationId, acceptedAt: null, expiresAt: { [Op.gt]: new Date() } },
        order: [['createdAt', 'DESC']],
      })
      return rows.map(publicInvitation)
    },

    async invite(actor: UserActor, input: InviteInput) {
      if (await models.User.findOne({ where: { email: input.email } })) {
        throw conflict('email_taken', 'Someone already uses this e-mail address', { email: 'already in use' })
      }
      const clientId = input.role === 'viewer' ? (input.clientId ?? null) : null
      if (input.clientId && input.role !== 'viewer') throw badRequest('clientId: only a viewer can sign in for a client', { clientId: 'only for viewers' })
      if (clientId && !(await models.Client.findOne({ where: { id: clientId, organizationId: actor.organizationId, archivedAt: null } }))) {
        throw badRequest('clientId: no such client', { clientId: 'no such client' })
      }
      // A client's person sees the client's tanks, never a whole site.
      const siteIds = input.role === 'viewer' && !clientId ? (input.siteIds ?? []) : []
      await assertSitesInOrganization(actor.organizationId, siteIds)
      const { token, hash } = newSecretToken()
      const link = `/accept-invite?token=${token}`
      // The invitation and its mail commit together; the link is also answered for the owner to pass on.
      const invitation = await sequelize.transaction(async (transaction) => {
        const created = await models.Invitation.create(
          {
            organizationId: actor.organizationId,
            email: input.email,
            name: input.name,
            role: input.role,
            siteIds,
            clientId,
            tokenHash: hash,
            invitedBy: actor.userId,
            expiresAt: new Date(Date.now() + INVITATION_DAYS * 86400_000),
          },
          { transaction },
        )
        // One after another: queries on one transaction's connection cannot run at once.
        const organization = await models.Organization.findByPk(actor.organizationId, { transaction })
        const inviter = await models.User.findByPk(actor.userId, { transaction })
        const mail = invitationMail({
          organizationName: organization?.name ?? '',
          inviterName: inviter?.name ?? 'An owner',
          link: `${ctx.config.publicUrl}${link}`,
          validHours: INVITATION_DAYS * 24,
        })
        await enqueueMail(
          ctx,
          { kind: 'invitation', to: input.email, ...mail, organizationId: actor.organizationId, dedupeKey: `invitation:${created.id}` },
          { transaction },
        )
        return created
      })
      return { invitation: publicInvitation(invitation), link }
    },

    async revokeInvitation(actor: UserActor, id: number) {
      const count = await models.Invitation.destroy({ where: { id, organizationId: actor.organizationId, acceptedAt: null } })
      if (!count) throw notFound('Invitation not found')
    },

    async describeInvitation(token: string) {
      const inv = await pendingInvitation(token)
      const organization = await models.Organization.findByPk(inv.organizationId)
      return {
        email: inv.email,
        name: inv.name,
        role: inv.role,
        organizationName: organization?.name ?? '',
        expiresAt: inv.expiresAt.toISOString(),
      }
    },

    async acceptInvitation(token: string, password: string, name?: string) {
      const user = await sequelize.transaction(async (transaction) => {
        const inv = await pendingInvitation(token)
        await inv.reload({ lock: transaction.LOCK.UPDATE, transaction })
        if (inv.acceptedAt) throw notFound('This invitation is unknown, already used or expired')
        if (await models.User.findOne({ where: { email: inv.email }, transaction })) {
          throw conflict('email_taken', 'Someone already uses this e-mail address')
        }
        const created = await models.User.create(
          {
            organizationId: inv.organizationId,
            email: inv.email,
            name: name ?? inv.name,
            role: inv.role,
            clientId: inv.clientId ?? null,
            passwordHash: await auth.hashPassword(password),
          },
          { transaction },
        )
        if (inv.siteIds.length) {
          await models.UserSite.bulkCreate(
            inv.siteIds.map((siteId) => ({ userId: created.id, siteId })),
            { transaction },
          )
        }
        await inv.update({ acceptedAt: new Date() }, { transaction })
        return created
      })
      await user.reload({ include })
      return auth.openSession(user)
    },
  }
})
