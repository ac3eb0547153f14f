import type { Transaction } from 'sequelize'
import type { RuleSeverity } from '@shared/rules/schema'
import type { AppContext } from '../context'
import type { Incident } from '../models'
import type { IncidentNotifier, NotifyKind, NotifyOptions } from './notifier'

export type AlertTiming = {
  escalateAlarmAfterMinutes: number
  escalateWarningAfterMinutes: number
  repeatEveryMinutes: number
  /** How long a tank's first mail waits for other tanks of its site to trip on the same cause; 0 mails at once. */
  siteGroupWaitSeconds?: number
}

export const RANK: Record<RuleSeverity, number> = { warning: 0, alarm: 1 }
export const isHigher = (a: RuleSeverity, b: RuleSeverity) => RANK[a] > RANK[b]
export const higherOf = (a: RuleSeverity, b: RuleSeverity): RuleSeverity => (isHigher(a, b) ? a : b)

export const escalateAfterMs = (timing: AlertTiming, severity: RuleSeverity) =>
  (severity === 'alarm' ? timing.escalateAlarmAfterMinutes : timing.escalateWarningAfterMinutes) * 60_000

/** What every incident operation shares: its timeline, its mails and its change event. */
export function incidentKit(ctx: AppContext, notifier: IncidentNotifier) {
  const { models, events } = ctx
  async function record(
    incidentId: number,
    kind: string,
    detail: Record<string, unknown>,
    transaction: Transaction,
    userId: number | null = null,
    at = new Date(),
  ) {
    await models.IncidentEvent.create({ incidentId, kind, detail, userId, at }, { transaction })
  }
  return {
    record,
    /** Mails about an incident are written in its own transaction (the outbox); the timeline says who. */
    async tell(kind: NotifyKind, incident: Incident, transaction: Transaction, options?: NotifyOptions) {
      const recipients = await notifier.notify(kind, incident, transaction, options)
      if (recipients.length) await record(incident.id, 'mail_queued', { kind, recipients }, transaction)
      return recipients
    },
    changed: (i: Incident) => events.emit('incident.changed', { incidentId: i.id, tankId: i.tankId, siteId: i.siteId, state: i.state }),
  }
}
