import type { Transaction } from 'sequelize'
import type { Incident, SiteIncident } from '../models'

/**
 * `raised`: its severity rose above anything it had reached (the ladder's one escalation mail);
 * `reopened`: it tripped again within its settle window and still held at the recheck;
 * `resolver`: it held again after someone resolved it by hand, told to that person only.
 */
export type NotifyKind = 'opened' | 'escalated' | 'repeated' | 'resolved' | 'raised' | 'reopened' | 'resolver'

export type NotifyOptions = {
  /** `resolver`: who resolved it. */
  userId?: number
  /** `opened` after a maintenance window ended while the condition still held. */
  afterMaintenance?: boolean
}

/**
 * Who is told what about an incident. Called inside the incident's transaction, so an
 * incident and its mails commit together (the transactional outbox).
 */
export interface IncidentNotifier {
  notify(kind: NotifyKind, incident: Incident, transaction: Transaction, options?: NotifyOptions): Promise<string[]>
  /** One mail for a site-wide fault, in place of each tank's own. */
  notifySite?(kind: 'opened' | 'escalated', site: SiteIncident, transaction: Transaction): Promise<string[]>
}

export const silentNotifier: IncidentNotifier = { notify: async () => [] }
