import { Op, QueryTypes, type Transaction } from 'sequelize'
import type { RuleSeverity, WatchRuleSpec } from '@shared/rules/schema'
import type { AppContext } from '../context'
import type { Incident } from '../models'
import type { IncidentNotifier } from './notifier'
import { escalateAfterMs, higherOf, incidentKit, isHigher, type AlertTiming } from './incident-kit'
import { siteGrouping } from './site-incidents'

export type TripInput = {
  rule: { id: number; name: string; severity: RuleSeverity; spec: WatchRuleSpec; metric: string }
  tank: { id: number; siteId: number; organizationId: number }
  at: number
  since: number
  value: number
  snoozed: boolean
  /** Every rule of the same condition on this tank (a warning and an alarm level): one incident between them. */
  ladder?: number[]
  /** A trip this long after the incident cleared reopens it (a flap) rather than opening another. */
  settleMs?: number
  /** A reopened incident is mailed again only if it still holds this long after reopening. */
  recheckMs?: number
  /** Inside a maintenance window: recorded, nobody told until the window ends. */
  maintenance?: boolean
  /** The kind of cause, for gathering several tanks' trips into one site incident. */
  cause?: string
  /** Values behind the compared one (a kit value and the probe's), kept in the timeline's opening entry. */
  detail?: Record<string, number>
}

/** The engine's side of an incident: trips, flaps, severity changes, clears and the timers. */
export function incidentLifecycle(ctx: AppContext, notifier: IncidentNotifier, timing: AlertTiming) {
  const { models, sequelize } = ctx
  const { record, tell, changed } = incidentKit(ctx, notifier)
  const silent = (i: Incident) => i.snoozed || i.maintenance
  const groupWaitMs = (timing.siteGroupWaitSeconds ?? 0) * 1000
  const sites = siteGrouping(ctx, notifier, timing)

  async function raiseIfHigher(incident: Incident, trip: TripInput, transaction: Transaction) {
    const to = trip.rule.severity
    if (!isHigher(to, incident.severity)) return
    const news = isHigher(to, incident.topSeverity)
    const escalation =
      incident.state === 'open'
        ? new Date(Math.min(incident.nextEscalationAt?.getTime() ?? Infinity, trip.at + escalateAfterMs(timing, to)))
        : incident.nextEscalationAt
    // A snooze may cover the lower level only (a heater-line alarm is snoozed only when asked by name).
    const unsnoozed = incident.snoozed && !trip.snoozed
    await record(incident.id, 'severity_raised', { from: incident.severity, to, value: trip.value, rule: trip.rule.name }, transaction, null, new Date(trip.at))
    await incident.update(
      {
        severity: to,
        topSeverity: higherOf(to, incident.topSeverity),
        title: trip.rule.name,
        nextEscalationAt: escalation,
        recheckAt: null,
        latestValue: trip.value,
        latestAt: new Date(trip.at),
        snoozed: incident.snoozed && trip.snoozed,
      },
      { transaction },
    )
    if (silent(incident) || incident.siteIncidentId) return
    // Nobody was told of the snoozed lower level: this is its first mail. Before a deferred first mail has gone, that mail carries the new severity.
    if (unsnoozed) await tell('opened', incident, transaction)
    else if (news && !incident.notifyAt) await tell('raised', incident, transaction)
  }

  async function reopenFlap(incident: Incident, trip: TripInput, transaction: Transaction) {
    const rises = isHigher(trip.rule.severity, incident.topSeverity)
    const resolver = incident.resolvedBy
    const state = incident.acknowledgedAt ? 'acknowledged' : 'open'
    await incident.update(
      {
        state,
        severity: trip.rule.severity,
        topSeverity: higherOf(trip.rule.severity, incident.topSeverity),
        title: rises ? trip.rule.name : incident.title,
        flapCount: incident.flapCount + 1,
        lastFlapAt: new Date(trip.at),
        resolvedAt: null,
        resolvedBy: null,
        resolveNote: null,
        settleUntil: null,
        allClearAt: null,
        latestValue: trip.value,
        latestAt: new Date(trip.at),
        recheckAt: rises ? null : new Date(trip.at + (trip.recheckMs ?? 0)),
        nextEscalationAt: rises && state === 'open' ? new Date(trip.at + escalateAfterMs(timing, trip.rule.severity)) : null,
        nextRepeatAt: null,
      },
      { transaction },
    )
    await record(
      incident.id,
      'flapped',
      { value: trip.value, count: incident.flapCount, since: new Date(trip.since).toISOString() },
      transaction,
      null,
      new Date(trip.at),
    )
    if (resolver) {
      await record(
        incident.id,
        'reopened',
        { reason: 'tripped_again', note: 'Reopened: the condition held again within the settle window after it was resolved' },
        transaction,
        null,
        new Date(trip.at),
      )
      await tell('resolver', incident, transaction, { userId: resolver })
    }
    if (rises && !silent(incident)) await tell('raised', incident, transaction)
  }

  async function create(trip: TripInput, transaction: Transaction) {
    const quiet = trip.snoozed || Boolean(trip.maintenance)
    const defer = !quiet && groupWaitMs > 0
    const created = await models.Incident.create(
      {
        organizationId: trip.tank.organizationId,
        siteId: trip.tank.siteId,
        tankId: trip.tank.id,
        ruleId: trip.rule.id,
        ruleKind: trip.rule.spec.kind,
        metric: trip.rule.metric,
        severity: trip.rule.severity,
        topSeverity: trip.rule.severity,
        title: trip.rule.name,
        state: 'open',
        conditionSince: new Date(trip.since),
        openedAt: new Date(trip.at),
        firstValue: trip.value,
        peakValue: trip.value,
        latestValue: trip.value,
        latestAt: new Date(trip.at),
        snoozed: trip.snoozed,
        maintenance: Boolean(trip.maintenance),
        cause: trip.cause ?? null,
        notifyAt: defer ? new Date(trip.at + groupWaitMs) : null,
        nextEscalationAt: trip.maintenance ? null : new Date(trip.at + escalateAfterMs(timing, trip.rule.severity)),
      },
      { transaction },
    )
    await record(
      created.id,
      'opened',
      { ...trip.detail, value: trip.value, since: new Date(trip.since).toISOString(), snoozed: trip.snoozed, maintenance: Boolean(trip.maintenance) },
      transaction,
      null,
      new Date(trip.at),
    )
    if (!quiet && !defer) await tell('opened', created, transaction)
    if (!quiet && trip.cause) await sites.consider(created, trip.at, transaction)
    return created
  }

  async function due(sql: string, now: number) {
    return sequelize.query<{ id: number }>(sql, { bind: [new Date(now)], type: QueryTypes.SELECT })
  }

  /** Runs `work` on the row locked (skipping one another instance holds), if it still matches `state`. */
  async function withRow(id: number, work: (row: Incident, transaction: Transaction) => Promise<void>) {
    const row = await sequelize.transaction(async (transaction) => {
      const [locked] = await sequelize.query('SELECT id FROM incidents WHERE id = $1 FOR UPDATE SKIP LOCKED', {
        bind: [id],
        type: QueryTypes.SELECT,
        transaction,
      })
      if (!locked) return null
      const incident = (await models.Incident.findByPk(id, { transaction }))!
      await work(incident, transaction)
      return incident
    })
    if (row) changed(row)
  }

  return {
    /** A rule tripped: opens its incident, raises the one its ladder has open, or reopens one still settling. */
    async trip(trip: TripInput): Promise<Incident> {
      const where = { ruleId: trip.ladder ?? [trip.rule.id], tankId: trip.tank.id }
      const incident = await sequelize.transaction(async (transaction) => {
        const lock = transaction.LOCK.UPDATE
        const existing = await models.Incident.findOne({ where: { ...where, state: { [Op.ne]: 'resolved' } }, transaction, lock })
        if (existing) {
          await raiseIfHigher(existing, trip, transaction)
          return existing
        }
        const settling = await models.Incident.findOne({
          where: { ...where, state: 'resolved', settleUntil: { [Op.gt]: new Date(trip.at) } },
          order: [['resolvedAt', 'DESC']],
          transaction,
          lock,
        })
        if (settling) {
          await reopenFlap(settling, trip, transaction)
          return settling
        }
        return create(trip, transaction)
      })
      changed(incident)
      return incident
    },

    /** The alarm level cleared while the warning level still holds: the same incident, lower. */
    async lower(incidentId: number, to: RuleSeverity, ruleName: string, at: number) {
      await withRow(incidentId, async (row, transaction) => {
        if (row.state === 'resolved' || !isHigher(row.severity, to)) return
        await record(row.id, 'severity_lowered', { from: row.severity, to, rule: ruleName }, transaction, null, new Date(at))
        await row.update({ severity: to, title: ruleName }, { transaction })
      })
    },

    async touch(incidentId: number, latest: number, peak: number, at: number) {
      await models.Incident.update({ latestValue: latest, peakValue: peak, latestAt: new Date(at) }, { where: { id: incidentId } })
    },

    /** The condition cleared. With a settle window the all-clear waits it out, and a trip inside it reopens this incident. */
    async resolveAutomatically(incidentId: number, at: number, value: number | undefined, reason = 'The rule cleared', settleMs = 0) {
      const incident = await sequelize.transaction(async (transaction) => {
        const incident = await models.Incident.findByPk(incidentId, { transaction, lock: transaction.LOCK.UPDATE })
        if (!incident || incident.state === 'resolved') return null
        const settleUntil = settleMs > 0 ? new Date(at + settleMs) : null
        await incident.update(
          {
            state: 'resolved',
            resolvedAt: new Date(at),
            resolveNote: reason,
            nextEscalationAt: null,
            nextRepeatAt: null,
            recheckAt: null,
            settleUntil,
            allClearAt: settleUntil && !silent(incident) ? settleUntil : null,
            ...(value !== undefined ? { latestValue: value } : {}),
          },
          { transaction },
        )
        await record(incident.id, 'resolved', { automatic: true, value, reason }, transaction, null, new Date(at))
        if (!silent(incident) && !settleUntil) await tell('resolved', incident, transaction)
        return incident
      })
      if (incident) changed(incident)
      if (incident?.siteIncidentId) await sites.resolveIfAllResolved(incident.siteIncidentId, at)
      return incident
    },

    /** Someone resolved it by hand while the engine still sees the condition: reopen it and tell them. */
    async reopenStillHolding(incidentId: number, at: number) {
      await withRow(incidentId, async (row, transaction) => {
        if (row.state !== 'resolved' || !row.resolvedBy) return
        const resolver = row.resolvedBy
        const state = row.acknowledgedAt ? 'acknowledged' : 'open'
        await record(
          row.id,
          'reopened',
          { reason: 'still_holding', note: 'Reopened: the condition still held after it was resolved', resolvedBy: resolver, resolveNote: row.resolveNote },
          transaction,
          null,
          new Date(at),
        )
        await row.update(
          {
            state,
            resolvedAt: null,
            resolvedBy: null,
            resolveNote: null,
            settleUntil: null,
            allClearAt: null,
            nextEscalationAt: state === 'open' ? new Date(at + escalateAfterMs(timing, row.severity)) : null,
          },
          { transaction },
        )
        await tell('resolver', row, transaction, { userId: resolver })
      })
    },

    /** A maintenance window ended while the condition still holds: tell the people on duty now. */
    async endMaintenance(incidentId: number, at: number) {
      await withRow(incidentId, async (row, transaction) => {
        if (row.state === 'resolved' || !row.maintenance) return
        await record(row.id, 'maintenance_ended', {}, transaction, null, new Date(at))
        await row.update(
          { maintenance: false, nextEscalationAt: row.state === 'open' ? new Date(at + escalateAfterMs(timing, row.severity)) : null },
          { transaction },
        )
        if (!row.snoozed) await tell('opened', row, transaction, { afterMaintenance: true })
      })
    },

    /** Deferred first mails, rechecks after a flap and all-clears whose time has come. */
    async processDeferred(now: number) {
      for (const { id } of await due(`SELECT id FROM incidents WHERE state <> 'resolved' AND notify_at <= $1 ORDER BY id LIMIT 200`, now)) {
        await withRow(id, async (row, transaction) => {
          if (row.state === 'resolved' || !row.notifyAt || row.notifyAt.getTime() > now) return
          await row.update({ notifyAt: null }, { transaction })
          // Part of a site incident: the site's one mail speaks for it.
          if (!row.siteIncidentId && !silent(row)) await tell('opened', row, transaction)
        })
      }
      for (const { id } of await due(`SELECT id FROM incidents WHERE state <> 'resolved' AND recheck_at <= $1 ORDER BY id LIMIT 200`, now)) {
        await withRow(id, async (row, transaction) => {
          if (row.state === 'resolved' || !row.recheckAt || row.recheckAt.getTime() > now) return
          await record(row.id, 'still_holding', { flaps: row.flapCount }, transaction, null, new Date(now))
          await row.update(
            {
              recheckAt: null,
              nextEscalationAt: row.state === 'open' && !row.maintenance ? new Date(now + escalateAfterMs(timing, row.severity)) : row.nextEscalationAt,
            },
            { transaction },
          )
          if (!silent(row) && !row.siteIncidentId) await tell('reopened', row, transaction)
        })
      }
      for (const { id } of await due(`SELECT id FROM incidents WHERE state = 'resolved' AND all_clear_at <= $1 ORDER BY id LIMIT 200`, now)) {
        await withRow(id, async (row, transaction) => {
          if (row.state !== 'resolved' || !row.allClearAt || row.allClearAt.getTime() > now) return
          await row.update({ allClearAt: null }, { transaction })
          await tell('resolved', row, transaction)
        })
      }
      await sites.processDue(now)
    },
  }
}
export type IncidentLifecycle = ReturnType<typeof incidentLifecycle>
