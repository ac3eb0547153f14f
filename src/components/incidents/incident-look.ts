import { isMetricKey } from '@shared/metrics/registry'
import type { IncidentDetail, IncidentState, PublicIncident } from '@shared/schemas/incidents'
import { SEVERITY_LOOKS, type Look } from '@/components/rules/rule-look'
import { formatMinutes, metricInSentence, ruleChange } from '@/components/rules/rule-words'
import { formatReading } from '@/composables/useUnits'
import { formatDateTime } from '@shared/time'

export { SEVERITY_LOOKS }

// Each state has its own word and icon shape; the colour only repeats what they say.
export const INCIDENT_STATE_LOOKS: Record<IncidentState, Look> = {
  open: { word: 'Open', icon: 'mdi-bell-ring', color: 'error' },
  acknowledged: { word: 'Acknowledged', icon: 'mdi-account-check', color: 'info' },
  resolved: { word: 'Resolved', icon: 'mdi-check-circle-outline', color: 'success' },
}

export const STATE_FILTER_ITEMS = [
  { value: 'unresolved', title: 'Not resolved (open or acknowledged)' },
  { value: 'open', title: 'Open' },
  { value: 'acknowledged', title: 'Acknowledged' },
  { value: 'resolved', title: 'Resolved' },
] as const

/**
 * A value the incident recorded, in words that fit its rule: a level reads as a reading
 * ("28.6 °C"), a `rate` value is the change across the window ("+0.42"), a `quiet` value is
 * minutes of silence.
 */
export function incidentValue(incident: Pick<PublicIncident, 'metric' | 'ruleKind'>, value: number | null | undefined): string {
  if (value == null || !Number.isFinite(value)) return '—'
  if (incident.ruleKind === 'quiet') return `no ${metricInSentence(incident.metric)} reading for ${formatMinutes(Math.round(value))}`
  if (!isMetricKey(incident.metric)) return String(value)
  if (incident.ruleKind === 'rate')
    return `${metricInSentence(incident.metric)} ${value >= 0 ? 'rose' : 'fell'} ${ruleChange(incident.metric, Math.abs(value))}`
  return formatReading(incident.metric, value)
}

export type NameOf = (userId: number | null | undefined) => string

export interface TimelineLine {
  at: string
  icon: string
  color?: string
  title: string
  detail?: string
}

const MAIL_WORDS: Record<string, string> = {
  opened: 'alert',
  escalated: 'escalation',
  repeated: 'reminder',
  resolved: 'all-clear',
  raised: 'severity rose',
  reopened: 'came back and holds',
  resolver: 'reopened, to the person who resolved it',
}

type Entry = IncidentDetail['timeline'][number]
const text = (value: unknown) => (typeof value === 'string' ? value : '')

/** One timeline entry in words; times in the site's zone. */
export function describeTimelineEntry(entry: Entry, incident: Pick<PublicIncident, 'metric' | 'ruleKind'>, nameOf: NameOf, timeZone?: string): TimelineLine {
  const d = entry.detail ?? {}
  const base = { at: formatDateTime(entry.at, timeZone) }
  switch (entry.kind) {
    case 'opened': {
      const since = text(d.since) ? `; the condition held from ${formatDateTime(text(d.since), timeZone)}` : ''
      const snoozed =
        d.snoozed === true ? ' The tank was snoozed, so nobody was e-mailed.' : d.maintenance === true ? ' During maintenance: recorded, nobody e-mailed.' : ''
      return { ...base, icon: 'mdi-bell-ring', color: 'error', title: 'Opened', detail: `${incidentValue(incident, d.value as number)}${since}.${snoozed}` }
    }
    case 'mail_queued': {
      const recipients = Array.isArray(d.recipients) ? d.recipients.map(String) : []
      return {
        ...base,
        icon: 'mdi-email-fast-outline',
        // "(phone)" or "(mail and phone)" after an address: the alert went to that person's phone too.
        title: `${recipients.some((r) => r.endsWith('phone)')) ? 'Alert' : 'E-mail'} queued: ${MAIL_WORDS[text(d.kind)] ?? text(d.kind)}`,
        detail: recipients.length ? `To ${recipients.join(', ')}` : undefined,
      }
    }
    case 'escalated':
      return {
        ...base,
        icon: 'mdi-arrow-up-bold-circle-outline',
        color: 'warning',
        title: `Escalated (level ${Number(d.level ?? 0)})`,
        detail: 'Nobody had acknowledged it; the owners were told too.',
      }
    case 'repeated':
      return { ...base, icon: 'mdi-repeat', title: 'Reminder', detail: 'Still not acknowledged: the alert went out again.' }
    case 'acknowledged': {
      const via = d.via === 'link' ? " from an alert's link" : ''
      return { ...base, icon: 'mdi-account-check', color: 'info', title: `Acknowledged by ${nameOf(entry.userId)}${via}`, detail: text(d.note) || undefined }
    }
    case 'resolved':
      if (d.automatic === true) {
        const value = typeof d.value === 'number' ? ` at ${incidentValue(incident, d.value)}` : ''
        return {
          ...base,
          icon: 'mdi-check-circle-outline',
          color: 'success',
          title: 'Resolved automatically',
          detail: `${text(d.reason) || 'The rule cleared'}${value}.`,
        }
      }
      return { ...base, icon: 'mdi-check-circle-outline', color: 'success', title: `Resolved by ${nameOf(entry.userId)}`, detail: text(d.note) || undefined }
    case 'severity_raised':
      return {
        ...base,
        icon: 'mdi-arrow-up-bold',
        color: 'error',
        title: `Rose to ${text(d.to) === 'alarm' ? 'alarm' : text(d.to)}`,
        detail: `${text(d.rule)}: ${incidentValue(incident, d.value as number)}.`,
      }
    case 'severity_lowered':
      return { ...base, icon: 'mdi-arrow-down-bold', color: 'warning', title: `Back to ${text(d.to)}`, detail: `${text(d.rule)} still holds.` }
    case 'flapped':
      return {
        ...base,
        icon: 'mdi-swap-vertical-bold',
        color: 'warning',
        title: `Flap ${Number(d.count ?? 0) + 1}: came back within the settle window`,
        detail: `${incidentValue(incident, d.value as number)}; counted on this incident, nobody e-mailed unless it holds.`,
      }
    case 'still_holding':
      return {
        ...base,
        icon: 'mdi-timer-alert-outline',
        color: 'error',
        title: 'Came back and still holds',
        detail: 'Past its recheck time: people were told again.',
      }
    case 'reopened':
      return {
        ...base,
        icon: 'mdi-restore-alert',
        color: 'error',
        title: 'Reopened',
        detail: `${text(d.note)}${d.resolvedBy ? ` (resolved by ${nameOf(d.resolvedBy as number)}, who was told)` : ''}.`,
      }
    case 'maintenance_ended':
      return {
        ...base,
        icon: 'mdi-wrench-check',
        color: 'warning',
        title: 'Maintenance window ended',
        detail: 'It still holds, so the people on duty were told.',
      }
    case 'joined_site_incident':
      return { ...base, icon: 'mdi-sitemap', color: 'warning', title: 'Part of a site incident', detail: text(d.title) }
    default:
      return { ...base, icon: 'mdi-circle-small', title: entry.kind.replace(/_/g, ' ') }
  }
}
