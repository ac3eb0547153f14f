import type { Transaction } from 'sequelize'
import { hashSecret, newSecretToken } from '../access/tokens'
import type { AppContext } from '../context'
import { AppError, notFound } from '../platform/errors'
import { incidentsOf } from './incidents'
import { clockStyleOf } from '../people'
import { perContext } from '../platform/per-context'

export const ACK_LINK_HOURS = 48

/** One-click acknowledge links for alert mails: signed by randomness, single use, expiring. */
export const ackLinksService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function find(token: string) {
    const link = await models.IncidentAckLink.findOne({ where: { tokenHash: hashSecret(token) } })
    if (!link) throw notFound('This acknowledge link is not known')
    return link
  }

  /** The incident as the page shows it; times are shown in the site's zone, so the zone comes along. */
  async function presentIncident(incidentId: number) {
    const incident = await models.Incident.findByPk(incidentId, {
      include: [
        { association: 'tank', attributes: ['name'] },
        { association: 'site', attributes: ['name', 'timeZone'] },
      ],
    })
    if (!incident) throw notFound('The incident no longer exists')
    const joined = incident as unknown as { tank?: { name: string }; site?: { name: string; timeZone: string } }
    const names = new Map(
      (
        await models.User.findAll({
          attributes: ['id', 'name'],
          where: { id: [incident.acknowledgedBy, incident.resolvedBy].filter((id): id is number => id != null) },
        })
      ).map((u) => [u.id, u.name]),
    )
    const person = (id: number | null | undefined) => (id == null ? null : { name: names.get(id) ?? 'former user' })
    return {
      id: incident.id,
      title: incident.title,
      severity: incident.severity,
      state: incident.state,
      tankName: joined.tank?.name ?? '',
      siteName: joined.site?.name ?? '',
      timeZone: joined.site?.timeZone ?? 'UTC',
      clockStyle: await clockStyleOf(ctx, incident.organizationId),
      openedAt: incident.openedAt.toISOString(),
      acknowledgedAt: incident.acknowledgedAt?.toISOString() ?? null,
      acknowledgedBy: person(incident.acknowledgedBy),
      resolvedAt: incident.resolvedAt?.toISOString() ?? null,
      resolvedBy: person(incident.resolvedBy),
    }
  }

  return {
    async create(incidentId: number, userId: number, transaction?: Transaction) {
      const { token, hash } = newSecretToken()
      await models.IncidentAckLink.create({ incidentId, userId, tokenHash: hash, expiresAt: new Date(Date.now() + ACK_LINK_HOURS * 3600_000) }, { transaction })
      return `${ctx.config.publicUrl}/ack?token=${token}`
    },

    async describe(token: string) {
      const link = await find(token)
      return {
        incident: await presentIncident(link.incidentId),
        usedAt: link.usedAt?.toISOString() ?? null,
        expiresAt: link.expiresAt.toISOString(),
        expired: link.expiresAt.getTime() <= Date.now(),
      }
    },

    /** Acknowledges as the person the mail went to; the link works once. */
    async use(token: string, note: string) {
      const link = await find(token)
      const outcome = await sequelize.transaction(async (transaction) => {
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
      // What the page shows afterwards: who acknowledged it and when, whoever that was.
      return { ...outcome, incident: await presentIncident(link.incidentId) }
    },
  }
})
