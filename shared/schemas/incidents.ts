import { z } from 'zod'
import type { ClockStyle } from './auth'
import { idSchema, pageQuerySchema } from './common'
import type { HeaterAge } from './equipment'
import { instantSchema } from './time'

export const INCIDENT_STATES = ['open', 'acknowledged', 'resolved'] as const
export type IncidentState = (typeof INCIDENT_STATES)[number]

export const incidentListQuerySchema = pageQuerySchema.extend({
  siteId: idSchema.optional(),
  tankId: idSchema.optional(),
  state: z.enum([...INCIDENT_STATES, 'unresolved']).optional(),
  severity: z.enum(['warning', 'alarm']).optional(),
  from: instantSchema.optional(),
  to: instantSchema.optional(),
})
export type IncidentListQuery = z.infer<typeof incidentListQuerySchema>

export const incidentNoteSchema = z.object({ note: z.string().trim().max(2000).default('') })
export const resolveNoteSchema = z.object({ note: z.string().trim().min(1, 'say what was done').max(2000) })
export const ackLinkSchema = z.object({ token: z.string().min(20).max(200), note: z.string().trim().max(2000).default('') })

export interface PublicIncident {
  id: number
  siteId: number
  tankId: number
  tankName: string
  siteName: string
  ruleId: number | null
  ruleKind: string
  metric: string
  severity: 'warning' | 'alarm'
  title: string
  state: IncidentState
  conditionSince: string
  openedAt: string
  firstValue: number | null
  peakValue: number | null
  latestValue: number | null
  latestAt: string | null
  snoozed: boolean
  acknowledgedAt: string | null
  acknowledgedBy: number | null
  acknowledgeNote: string | null
  resolvedAt: string | null
  resolvedBy: number | null
  resolveNote: string | null
  escalationLevel: number
  nextEscalationAt: string | null
  nextRepeatAt: string | null
  /** The highest severity it reached. */
  topSeverity: 'warning' | 'alarm'
  /** Times it cleared and tripped again within its rule's settle window. */
  flapCount: number
  lastFlapAt: string | null
  /** Resolved: until then a trip reopens it. */
  settleUntil: string | null
  /** Opened during a maintenance window: recorded, nobody told. */
  maintenance: boolean
  siteIncidentId: number | null
  /** Unresolved with its rule still watching: resolving it now would see it reopen. */
  conditionHolds: boolean
}

export interface IncidentDetail extends PublicIncident {
  timeline: Array<{ at: string; kind: string; userId: number | null; detail: Record<string, unknown> }>
  /** For a temperature incident: the tank's heater and its age, when one is recorded. */
  heater: HeaterAge | null
}

/** What an acknowledge link from an alert mail points at; readable without a session. */
export interface AckLinkIncident {
  id: number
  title: string
  severity: 'warning' | 'alarm'
  state: IncidentState
  tankName: string
  siteName: string
  /** The site's zone: every time on the page is shown on its clock. */
  timeZone: string
  /** The organisation's clock: the page is read without a session, so it cannot come from one. */
  clockStyle: ClockStyle
  openedAt: string
  acknowledgedAt: string | null
  acknowledgedBy: { name: string } | null
  resolvedAt: string | null
  resolvedBy: { name: string } | null
}

export interface AckLinkInfo {
  incident: AckLinkIncident
  usedAt: string | null
  expiresAt: string
  expired: boolean
}

export interface AckLinkResult {
  state: string
  /** Someone had already acknowledged or resolved it; the link is spent all the same. */
  alreadyHandled: boolean
  /** The incident after the press: acknowledged, by whom and when. */
  incident: AckLinkIncident
}
