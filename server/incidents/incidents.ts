import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize'
import { DEFAULT_SETTLE_MINUTES } from '@shared/rules/schema'
import type { IncidentListQuery, PublicIncident } from '@shared/schemas/incidents'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { conflict, notFound } from '../platform/errors'
import type { Incident } from '../models'
import type { IncidentNotifier } from './notifier'
import { incidentKit, type AlertTiming } from './incident-kit'
import { incidentLifecycle } from './lifecycle'
import { siteScope } from '../access/scope'
import { siteGrouping } from './site-incidents'
import { heaterAge } from '../equipment'

export type { AlertTiming } from './incident-kit'
export type { TripInput } from './lifecycle'

export { DEFAULT_SETTLE_MINUTES } from '@shared/rules/schema'

export function presentIncident(i: Incident & { tank?: { name: string }; site?: { name: string } }): PublicIncident {
  const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)
  return {
    id: i.id,
    siteId: i.siteId,
    tankId: i.tankId,
    tankName: i.tank?.name ?? '',
    siteName: i.site?.name ?? '',
    ruleId: i.ruleId,
    ruleKind: i.ruleKind,
    metric: i.metric,
    severity: i.severity,
    title: i.title,
    state: i.state,
    conditionSince: i.conditionSince.toISOString(),
    openedAt: i.openedAt.toISOString(),
    firstValue: i.firstValue,
    peakValue: i.peakValue,
    latestValue: i.latestValue,
    latestAt: iso(i.latestAt),
    snoozed: i.snoozed,
    acknowledgedAt: iso(i.acknowledgedAt),
    acknowledgedBy: i.acknowledgedBy ?? null,
    acknowledgeNote: i.acknowledgeNote ?? null,
    resolvedAt: iso(i.resolvedAt),
    resolvedBy: i.resolvedBy ?? null,
    resolveNote: i.resolveNote ?? null,
    escalationLevel: i.escalationLevel,
    nextEscalationAt: iso(i.nextEscalationAt),
    nextRepeatAt: iso(i.nextRepeatAt),
    topSeverity: i.topSeverity,
    flapCount: i.flapCount,
    lastFlapAt: iso(i.lastFlapAt),
    settleUntil: iso(i.settleUntil),
    maintenance: i.maintenance,
    siteIncidentId: i.siteIncidentId ?? null,
    // The engine resolves an incident the moment its condition clears, so an unresolved one still holds.
    conditionHolds: i.state !== 'resolved' && i.ruleId !== null,
  }
}

/** Incidents: opened by the engine, acknowledged and resolved by people, escalated on stored timers. */
export function incidentsService(ctx: AppContext, notifier: IncidentNotifier, timing: AlertTiming) {
  const { models, sequelize } = ctx
  const include = [
    { association: 'tank', attributes: ['id', 'name'] },
    { association: 'site', attributes: ['id', 'name', 'timeZone'] },
  ]
  const { record, tell, changed } = incidentKit(ctx, notifier)
  const lifecycle = incidentLifecycle(ctx, notifier, timing)
  const sites = siteGrouping(ctx, notifier, timing)

  async function findVisible(actor: UserActor, id: number) {
    const incident = await models.Incident.findOne({ where: { id, ...(siteScope(actor, 'siteId') as object) }, include })
    if (!incident) throw notFound('Incident not found')
    return incident
  }

  /** The row locked for this transaction, read afresh: two people acting at once must not both pass the state check. */
  async function lockedRow(id: number, transaction: Transaction) {
    const row = await models.Incident.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row) throw notFound('Incident not found')
    return row
  }

  async function acknowledgeIncident(incident: Incident, userId: number, note: string, via: 'app' | 'link', transaction: Transaction) {
    if (incident.state !== 'open') throw conflict('not_open', `This incident is already ${incident.state}`)
    // Acknowledging stops every pending escalation and repeat at once: the timers live in these columns.
    await incident.update(
      { state: 'acknowledged', acknowledgedAt: new Date(), acknowledgedBy: userId, acknowledgeNote: note || null, nextEscalationAt: null, nextRepeatAt: null },
      { transaction },
    )
    await record(incident.id, 'acknowledged', { note, via }, transaction, userId)
    if (incident.siteIncidentId) await sites.acknowledge(incident.siteIncidentId, userId, transaction)
  }

  async function settleMinutesOf(ruleId: number | null, transaction: Transaction) {
    const rule = ruleId ? await models.WatchRule.findByPk(ruleId, { transaction }) : null
    return rule?.spec.settleMinutes ?? DEFAULT_SETTLE_MINUTES
  }

  return {
    findVisible,
    acknowledgeIncident,

    ...lifecycle,

    async acknowledge(actor: UserActor, id: number, note: string) {
      const incident = await findVisible(actor, id)
      await sequelize.transaction(async (transaction) => acknowledgeIncident(await lockedRow(incident.id, transaction), actor.userId, note, 'app', transaction))
      await incident.reload()
      changed(incident)
      return presentIncident(incident)
    },

    async resolveByHand(actor: UserActor, id: number, note: string) {
      const incident = await findVisible(actor, id)
      await sequelize.transaction(async (transaction) => {
        const row = await lockedRow(incident.id, transaction)
        if (row.state === 'resolved') throw conflict('not_open', 'This incident is already resolved')
        // A trip inside the settle window reopens it, and the engine reopens it at once if the condition still holds.
        const settleUntil = new Date(Date.now() + (await settleMinutesOf(row.ruleId, transaction)) * 60_000)
        await row.update(
          {
            state: 'resolved',
            resolvedAt: new Date(),
            resolvedBy: actor.userId,
            resolveNote: note,
            nextEscalationAt: null,
            nextRepeatAt: null,
            recheckAt: null,
            settleUntil,
          },
          { transaction },
        )
        await record(row.id, 'resolved', { automatic: false, note }, transaction, actor.userId)
        await tell('resolved', row, transaction)
      })
      if (incident.siteIncidentId) await sites.resolveIfAllResolved(incident.siteIncidentId, Date.now())
      await incident.reload()
      changed(incident)
      return presentIncident(incident)
    },

    async list(actor: UserActor, q: IncidentListQuery) {
      const where: Record<string | symbol, unknown> = { ...(siteScope(actor, 'siteId') as object) }
      if (q.siteId) where.siteId = actor.siteIds && !actor.siteIds.includes(q.siteId) ? -1 : q.siteId
      if (q.tankId) where.tankId = q.tankId
      if (q.state === 'unresolved') where.state = { [Op.ne]: 'resolved' }
      else if (q.state) where.state = q.state
      if (q.severity) where.severity = q.severity
      if (q.from || q.to) where.openedAt = { ...(q.from ? { [Op.gte]: new Date(q.from) } : {}), ...(q.to ? { [Op.lt]: new Date(q.to) } : {}) }
      const { rows, count } = await models.Incident.findAndCountAll({
        where: where as WhereOptions,
        include,
        order: [['openedAt', 'DESC']],
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      })
      return { items: rows.map(presentIncident), total: count, page: q.page, pageSize: q.pageSize }
    },

    async get(actor: UserActor, id: number) {
      const incident = await findVisible(actor, id)
      // In the order things happened here; `at` is the time each one refers to.
      const timeline = await models.IncidentEvent.findAll({ where: { incidentId: id }, order: [['id', 'ASC']] })
      return {
        ...presentIncident(incident),
        timeline: timeline.map((e) => ({ at: e.at.toISOString(), kind: e.kind, userId: e.userId ?? null, detail: e.detail })),
        // A temperature fault is often the heater's: its age is the first thing worth knowing.
        heater: incident.metric === 'temperature' ? await heaterAge(ctx, incident.tankId) : null,
      }
    },

    /** Open tanks' incidents for the wall: one query. */
    async openForTanks(tankIds: number[]) {
      if (!tankIds.length) return []
      return models.Incident.findAll({ where: { tankId: tankIds, state: { [Op.ne]: 'resolved' } }, order: [['openedAt', 'DESC']] })
    },

    /** Escalations and repeats whose stored time has come; safe to run from several instances. */
    async processDue(now = Date.now()) {
      const due = await sequelize.query<{ id: number }>(
        `SELECT id FROM incidents WHERE state = 'open' AND NOT maintenance AND (next_escalation_at <= $1 OR next_repeat_at <= $1) ORDER BY id LIMIT 100`,
        { bind: [new Date(now)], type: QueryTypes.SELECT },
      )
      let handled = 0
      for (const { id } of due) {
        const done = await sequelize.transaction(async (transaction) => {
          const [row] = await sequelize.query<{ id: number }>('SELECT id FROM incidents WHERE id = $1 AND state = $2 FOR UPDATE SKIP LOCKED', {
            bind: [id, 'open'],
            type: QueryTypes.SELECT,
            transaction,
          })
          if (!row) return false
          const incident = (await models.Incident.findByPk(id, { transaction }))!
          const repeatAt = new Date(now + timing.repeatEveryMinutes * 60_000)
          if (incident.nextEscalationAt && incident.nextEscalationAt.getTime() <= now) {
            await incident.update({ escalationLevel: incident.escalationLevel + 1, nextEscalationAt: null, nextRepeatAt: repeatAt }, { transaction })
            await record(incident.id, 'escalated', { level: incident.escalationLevel }, transaction, null, new Date(now))
            if (!incident.snoozed) await tell('escalated', incident, transaction)
          } else {
            await incident.update({ nextRepeatAt: repeatAt }, { transaction })
            await record(incident.id, 'repeated', {}, transaction, null, new Date(now))
            if (!incident.snoozed) await tell('repeated', incident, transaction)
          }
          return true
        })
        if (done) handled++
      }
      await lifecycle.processDeferred(now)
      return handled
    },
  }
}
export type IncidentsService = ReturnType<typeof incidentsService>

/** The incidents service as the app is configured (its notifier and timings). */
export const incidentsOf = (ctx: AppContext) => incidentsService(ctx, ctx.incidents.notifier, ctx.config.incidentTiming)
