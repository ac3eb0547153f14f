import type { Transaction } from 'sequelize'
import type { Incident } from '../models'

export type NotifyKind = 'opened' | 'escalated' | 'repeated' | 'resolved'

/**
 * Who is told what about an incident. Called inside the incident's transaction, so an
 * incident and its mails commit together (the transactional outbox).
 */
export interface IncidentNotifier {
  notify(kind: NotifyKind, incident: Incident, transaction: Transaction): Promise<string[]>
}

export const silentNotifier: IncidentNotifier = { notify: async () => [] }
