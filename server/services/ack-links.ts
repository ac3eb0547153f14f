import type { Transaction } from 'sequelize'
import { hashSecret, newSecretToken } from '../auth/tokens'
import type { AppContext } from '../context'
import { AppError, notFound } from '../errors'
import { incidentsOf } from './incidents'

export const ACK_LINK_HOURS = 48

/** One-click acknowledge links for alert mails: signed by randomness, single use, expiring. */
export function ackLinksService(ctx: AppContext) {
  const { models, sequelize } = ctx

  async function find(token: string) {
    const link = await models.IncidentAckLink.findOne({ where: { tokenHash: hashSecret(token) } })
    if (!link) throw notFound('This acknowledge link is not known')
    return link
  }

  return {
    async create(incidentId: number, userId: number, transaction?: Transaction) {
      const { token, hash } = newSecretToken()
      await models.IncidentAckLink.create(
        { incidentId, userId, tokenHash: hash, expiresAt: new Date(Date.now() + ACK_LINK_HOURS * 3600_000) },
        { transaction },
      )
      return `${ctx.config.publicUrl}/ack?token=${token}`
    },

    async describe(token: string) {
      const link = await find(token)
      const incident = await models.Incident.findByPk(link.incidentId, { include: [{ association: 'tank', attributes: ['name'] }] })
      if (!incident) throw notFound('The incident no longer exists')
      return {
        incident: { id: incident.id, title: incident.title, severity: incident.severity, state: incident.state, tankName: (incident as unknown as { tank?: { name: string } }).tank?.name ?? '', openedAt: incident.openedAt.toISOString() },
        usedAt: link.usedAt?.toISOString() ?? null,
        expiresAt: link.expiresAt.toISOString(),
        expired: link.expiresAt.getTime() <= Date.now(),
      }
    },

    /** Acknowledges as the person the mail went to; the link works once. */
    async use(token: string, note: string) {
      return sequelize.transaction(async (transaction) => {
        const link = await find(token)
        await link.reload({ lock: transaction.LOCK.UPDATE, transaction })
        if (link.usedAt) throw new AppError(409, 'link_used', `This link was already used on ${link.usedAt.toISOString()}`)
        if (link.expiresAt.getTime() <= Date.now()) throw new AppError(410, 'link_expired', 'This link has expired; acknowledge in the app')
        const person = await models.User.findByPk(link.userId, { transaction })
        if (!person?.active) throw new AppError(410, 'link_expired', 'This link belongs to an account that is no longer active')
        const incident = await models.Incident.findByPk(link.incidentId, { transaction, lock: transaction.LOCK.UPDATE })
        if (!incident) throw notFound('The incident no longer exists')
        await link.update({ usedAt: new Date() }, { transaction })
        if (incident.state !== 'open') return { state: incident.state, alreadyHandled: true }
        await incidentsOf(ctx).acknowledgeIncident(incident, link.userId, note, 'link', transaction)
        transaction.afterCommit(() =>
          ctx.events.emit('incident.changed', { incidentId: incident.id, tankId: incident.tankId, siteId: incident.siteId, state: 'acknowledged' }),
        )
        return { state: 'acknowledged', alreadyHandled: false }
      })
    },
  }
}
