import type { TankState } from './tank-status'
import type { ChecklistItem } from './setup'

type Named = { id: number; name: string }

export interface OverviewIncident {
  id: number
  title: string
  severity: string
  state: 'open' | 'acknowledged' | 'resolved'
  tank: Named
  openedAt: string
  acknowledgedAt: string | null
  acknowledgedBy: Named | null
  /** Minutes from opening to acknowledgement; null while nobody has. */
  ackMinutes: number | null
}

export interface OverviewTask {
  taskId: number
  title: string
  kind: string
  tank: Named
  /** `YYYY-MM-DD` on the site's calendar. */
  dueOn: string
}

export interface OverviewSite {
  site: { id: number; name: string; timeZone: string }
  /** The end of yesterday's working day: where "since" starts. */
  since: string
  /** HH:MM on the site's clock; `workdayEndAssumed` says the site names none and the default is used. */
  workdayEnd: string
  workdayEndAssumed: boolean
  states: Record<TankState, number>
  overnight: {
    incidents: OverviewIncident[]
    /** Tanks whose devices fell quiet since then, or are quiet now. */
    quietTanks: Array<{ tank: Named; since: string | null; quietNow: boolean }>
    careMissed: OverviewTask[]
    kitOverdue: OverviewTask[]
    waterChanges: Array<{ tank: Named; at: string; by: string | null }>
    /** Service visits here not closed by the end of their day. */
    visitsLeftOpen: Array<{ id: number; clientName: string; technician: string; startsAt: string }>
  }
  today: {
    onDuty: Named[]
    backup: Named | null
    careDue: OverviewTask[]
    quarantine: Array<{ tank: Named; daysIn: number | null; days: number }>
  }
}

export interface Overview {
  now: string
  sites: OverviewSite[]
  /** The owner's first steps still open; null for keepers. */
  checklist: { items: ChecklistItem[]; firstSiteId: number | null; firstTankId: number | null } | null
}
