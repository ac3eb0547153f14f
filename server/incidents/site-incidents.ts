import { Op, QueryTypes, type Transaction } from 'sequelize'
import { CAUSE_TITLES, type CauseKey } from '@shared/rules/cause'
import type { AppContext } from '../context'
import type { Incident, SiteIncident } from '../models'
import type { IncidentNotifier } from './notifier'
import { escalateAfterMs, higherOf, incidentKit, type AlertTiming } from './incident-kit'

// Tanks tripping on one kind of cause within five minutes of each other, three or more of them,
// are taken for one site-wide fault (common practice in alerting: group before paging).
export const SITE_WINDOW_MS = 5 * 60_000
export const SITE_MIN_TANKS = 3
const SITE_LOCK = 7_411_010

/** One incident for a fault that hits several tanks of a site at once, linking each tank's own. */
export function siteGrouping(ctx: AppContext, notifier: IncidentNotifier, timing: AlertTiming) {
  const { models, sequelize } = ctx
  const { record } = incidentKit(ctx, notifier)
  const groupWaitMs = (timing.siteGroupWaitSeconds ?? 0) * 1000

  async function link(incident: Incident, site: SiteIncident, transaction: Transaction) {
    // The site incident escalates for all of them; the tank's own keeps its timeline and tile.
    await incident.update({ siteIncidentId: site.id, notifyAt: null, nextEscalationAt: null, nextRepeatAt: null }, { transaction })
    await record(incident.id, 'joined_site_incident', { siteIncidentId: site.id, title: site.title }, transaction)
  }

  return {
    /** Called as a tank's incident opens: joins the site's open incident of its cause, or forms one. */
    async consider(incident: Incident, at: number, transaction: Transaction) {
      if (!incident.cause) return
      await sequelize.query('SELECT pg_advisory_xact_lock($1, $2)', { bind: [SITE_LOCK, incident.siteId], transaction })
      const open = await models.SiteIncident.findOne({ where: { siteId: incident.siteId, cause: incident.cause, state: { [Op.ne]: 'resolved' } }, transaction })
      if (open) {
        await link(incident, open, transaction)
        if (higherOf(incident.severity, open.severity) !== open.severity) await open.update({ severity: incident.severity }, { transaction })
        return
      }
      const siblings = await models.Incident.findAll({
        where: {
          siteId: incident.siteId,
          cause: incident.cause,
          state: { [Op.ne]: 'resolved' },
          siteIncidentId: null,
          snoozed: false,
          maintenance: false,
          openedAt: { [Op.between]: [new Date(at - SITE_WINDOW_MS), new Date(at + SITE_WINDOW_MS)] },
        },
        transaction,
      })
      if (new Set(siblings.map((s) => s.tankId)).size < SITE_MIN_TANKS) return
      const severity = siblings.reduce((worst, s) => higherOf(worst, s.severity), siblings[0].severity)
      const site = await models.SiteIncident.create(
        {
          organizationId: incident.organizationId,
          siteId: incident.siteId,
          cause: incident.cause,
          severity,
          title: CAUSE_TITLES[incident.cause as CauseKey] ?? 'Several tanks at once',
          state: 'open',
          openedAt: new Date(at),
          nextEscalationAt: new Date(at + escalateAfterMs(timing, severity)),
          notifyAt: groupWaitMs ? new Date(at + groupWaitMs) : null,
        },
        { transaction },
      )
      for (const s of siblings) await link(s, site, transaction)
      if (!groupWaitMs) await notifier.notifySite?.('opened', site, transaction)
    },

    /** A site incident is over when every tank's incident in it is. */
    async resolveIfAllResolved(siteIncidentId: number, at: number) {
      await sequelize.query(
        `UPDATE site_incidents SET state = 'resolved', resolved_at = $2, next_escalation_at = NULL, updated_at = now()
         WHERE id = $1 AND state <> 'resolved' AND NOT EXISTS (SELECT 1 FROM incidents WHERE site_incident_id = $1 AND state <> 'resolved')`,
        { bind: [siteIncidentId, new Date(at)] },
      )
    },

    /** The site's one mail once the grouping wait is over; one escalation, to the backup and the owners, if nobody acknowledged it. */
    async processDue(now: number) {
      const waiting = await sequelize.query<{ id: number }>(
        `SELECT id FROM site_incidents WHERE state <> 'resolved' AND notify_at <= $1 ORDER BY id LIMIT 50`,
        { bind: [new Date(now)], type: QueryTypes.SELECT },
      )
      for (const { id } of waiting) {
        await sequelize.transaction(async (transaction) => {
          const [row] = await sequelize.query('SELECT id FROM site_incidents WHERE id = $1 AND notify_at IS NOT NULL FOR UPDATE SKIP LOCKED', {
            bind: [id],
            type: QueryTypes.SELECT,
            transaction,
          })
          if (!row) return
          const site = (await models.SiteIncident.findByPk(id, { transaction }))!
          await site.update({ notifyAt: null }, { transaction })
          await notifier.notifySite?.('opened', site, transaction)
        })
      }
      const due = await sequelize.query<{ id: number }>(
        `SELECT id FROM site_incidents WHERE state = 'open' AND next_escalation_at <= $1 ORDER BY id LIMIT 50`,
        { bind: [new Date(now)], type: QueryTypes.SELECT },
      )
      for (const { id } of due) {
        await sequelize.transaction(async (transaction) => {
          const [row] = await sequelize.query('SELECT id FROM site_incidents WHERE id = $1 AND state = $2 FOR UPDATE SKIP LOCKED', {
            bind: [id, 'open'],
            type: QueryTypes.SELECT,
            transaction,
          })
          if (!row) return
          const site = (await models.SiteIncident.findByPk(id, { transaction }))!
          await site.update({ escalationLevel: site.escalationLevel + 1, nextEscalationAt: null }, { transaction })
          await notifier.notifySite?.('escalated', site, transaction)
        })
      }
    },

    /** Acknowledged anywhere (the site incident or one tank's): the site's escalation stops, and so do its tanks'. */
    async acknowledge(siteIncidentId: number, userId: number, transaction: Transaction) {
      const site = await models.SiteIncident.findByPk(siteIncidentId, { transaction, lock: transaction.LOCK.UPDATE })
      if (!site || site.state !== 'open') return
      await site.update({ state: 'acknowledged', acknowledgedAt: new Date(), acknowledgedBy: userId, nextEscalationAt: null }, { transaction })
      await models.Incident.update(
        { state: 'acknowledged', acknowledgedAt: new Date(), acknowledgedBy: userId, nextEscalationAt: null, nextRepeatAt: null, recheckAt: null },
        { where: { siteIncidentId, state: 'open' }, transaction },
      )
    },
  }
}
