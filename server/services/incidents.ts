import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize'
import type { RuleSeverity, WatchRuleSpec } from '@shared/rules/schema'
import type { IncidentListQuery, PublicIncident } from '@shared/schemas/incidents'
import type { UserActor } from '../auth/actor'
import type { AppContext } from '../context'
import { conflict, notFound } from '../errors'
import type { Incident } from '../models'
import type { IncidentNotifier, NotifyKind } from '../rules/notifier'
import { siteScope } from './scope'

export type AlertTiming = { escalateAlarmAfterMinutes: number; escalateWarningAfterMinutes: number; repeatEveryMinutes: number }

export type TripInput = {
  rule: { id: number; name: string; severity: RuleSeverity; spec: WatchRuleSpec; metric: string }
  tank: { id: number; siteId: number; organizationId: number }
  at: number
  since: number
  value: number
  snoozed: boolean
}

export function presentIncident(i: Incident & { tank?: { name: string }; site?: { name: string } }): PublicIncident {
  const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)
  return {
    id: i.id, siteId: i.siteId, tankId: i.tankId, tankName: i.tank?.name ?? '', siteName: i.site?.name ?? '',
    ruleId: i.ruleId, ruleKind: i.ruleKind, metric: i.metric, severity: i.severity, title: i.title, state: i.state,
    conditionSince: i.conditionSince.toISOString(), openedAt: i.openedAt.toISOString(),
    firstValue: i.firstValue, peakValue: i.peakValue, latestValue: i.latestValue, latestAt: iso(i.latestAt),
    snoozed: i.snoozed, acknowledgedAt: iso(i.acknowledgedAt), acknowledgedBy: i.acknowledgedBy ?? null, acknowledgeNote: i.acknowledgeNote ?? null,
    resolvedAt: iso(i.resolvedAt), resolvedBy: i.resolvedBy ?? null, resolveNote: i.resolveNote ?? null,
    escalationLevel: i.escalationLevel, nextEscalationAt: iso(i.nextEscalationAt), nextRepeatAt: iso(i.nextRepeatAt),
  }
}

/** Incidents: opened by the engine, acknowledged and resolved by people, escalated on stored timers. */
export function incidentsService(ctx: AppContext, notifier: IncidentNotifier, timing: AlertTiming) {
  const { models, sequelize, events } = ctx
  const include = [
    { association: 'tank', attributes: ['id', 'name'] },
    { association: 'site', attributes: ['id', 'name', 'timeZone'] },
  ]
  const changed = (i: Incident) => events.emit('incident.changed', { incidentId: i.id, tankId: i.tankId, siteId: i.siteId, state: i.state })

  async function record(incidentId: number, kind: string, detail: Record<string, unknown>, transaction: Transaction, userId: number | null = null, at = new Date()) {
    await models.IncidentEvent.create({ incidentId, kind, detail, userId, at }, { transaction })
  }

  async function tell(kind: NotifyKind, incident: Incident, transaction: Transaction) {
    const recipients = await notifier.notify(kind, incident, transaction)
    if (recipients.length) await record(incident.id, `mail_queued`, { kind, recipients }, transaction)
  }

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
  }

  return {
    findVisible,
    acknowledgeIncident,

    /** Opens the incident for a trip, unless one is already unresolved for this rule and tank. */
    async open(trip: TripInput): Promise<Incident | null> {
      const escalateMinutes = trip.rule.severity === 'alarm' ? timing.escalateAlarmAfterMinutes : timing.escalateWarningAfterMinutes
      const incident = await sequelize.transaction(async (transaction) => {
        const existing = await models.Incident.findOne({
          where: { ruleId: trip.rule.id, tankId: trip.tank.id, state: { [Op.ne]: 'resolved' } }, transaction,
        })
        if (existing) return null
        const created = await models.Incident.create(
          {
            organizationId: trip.tank.organizationId, siteId: trip.tank.siteId, tankId: trip.tank.id, ruleId: trip.rule.id,
            ruleKind: trip.rule.spec.kind, metric: trip.rule.metric, severity: trip.rule.severity, title: trip.rule.name,
            state: 'open', conditionSince: new Date(trip.since), openedAt: new Date(trip.at),
            firstValue: trip.value, peakValue: trip.value, latestValue: trip.value, latestAt: new Date(trip.at), snoozed: trip.snoozed,
            nextEscalationAt: new Date(trip.at + escalateMinutes * 60_000),
          },
          { transaction },
        )
        await record(created.id, 'opened', { value: trip.value, since: new Date(trip.since).toISOString(), snoozed: trip.snoozed }, transaction, null, new Date(trip.at))
        if (!trip.snoozed) await tell('opened', created, transaction)
        return created
      })
      if (incident) changed(incident)
      return incident
    },

    async touch(incidentId: number, latest: number, peak: number, at: number) {
      await models.Incident.update({ latestValue: latest, peakValue: peak, latestAt: new Date(at) }, { where: { id: incidentId } })
    },

    async resolveAutomatically(incidentId: number, at: number, value: number | undefined, reason = 'The rule cleared') {
      const incident = await sequelize.transaction(async (transaction) => {
        const incident = await models.Incident.findByPk(incidentId, { transaction, lock: transaction.LOCK.UPDATE })
        if (!incident || incident.state === 'resolved') return null
        await incident.update(
          { state: 'resolved', resolvedAt: new Date(at), resolveNote: reason, nextEscalationAt: null, nextRepeatAt: null, ...(value !== undefined ? { latestValue: value } : {}) },
          { transaction },
        )
        await record(incident.id, 'resolved', { automatic: true, value, reason }, transaction, null, new Date(at))
        if (!incident.snoozed) await tell('resolved', incident, transaction)
        return incident
      })
      if (incident) changed(incident)
      return incident
    },

    async acknowledge(actor: UserActor, id: number, note: string) {
      const incident = await findVisible(actor, id)
      await sequelize.transaction(async (transaction) =>
        acknowledgeIncident(await lockedRow(incident.id, transaction), actor.userId, note, 'app', transaction),
      )
      await incident.reload()
      changed(incident)
      return presentIncident(incident)
    },

    async resolveByHand(actor: UserActor, id: number, note: string) {
      const incident = await findVisible(actor, id)
      await sequelize.transaction(async (transaction) => {
        const row = await lockedRow(incident.id, transaction)
        if (row.state === 'resolved') throw conflict('not_open', 'This incident is already resolved')
        await row.update(
          { state: 'resolved', resolvedAt: new Date(), resolvedBy: actor.userId, resolveNote: note, nextEscalationAt: null, nextRepeatAt: null },
          { transaction },
        )
        await record(row.id, 'resolved', { automatic: false, note }, transaction, actor.userId)
        await tell('resolved', row, transaction)
      })
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
        where: where as WhereOptions, include, order: [['openedAt', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize,
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
        `SELECT id FROM incidents WHERE state = 'open' AND (next_escalation_at <= $1 OR next_repeat_at <= $1) ORDER BY id LIMIT 100`,
        { bind: [new Date(now)], type: QueryTypes.SELECT },
      )
      let handled = 0
      for (const { id } of due) {
        const done = await sequelize.transaction(async (transaction) => {
          const [row] = await sequelize.query<{ id: number }>('SELECT id FROM incidents WHERE id = $1 AND state = $2 FOR UPDATE SKIP LOCKED', {
            bind: [id, 'open'], type: QueryTypes.SELECT, transaction,
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
      return handled
    },
  }
}
export type IncidentsService = ReturnType<typeof incidentsService>

/** The incidents service as the app is configured (its notifier and timings). */
export const incidentsOf = (ctx: AppContext) => incidentsService(ctx, ctx.alerts.notifier, ctx.config.alertTiming)
