import { formatDay, formatZonedDateTime, formatDuration } from '@shared/time'
import type { ClockStyle } from '@shared/schemas/auth'
import type { PublicVisit, VisitTankWork } from '@shared/schemas/visits'

/** The words of a visit report, shared by its mail and its PDF so both say the same. */
export const VERDICT_WORDS: Record<VisitTankWork['readings'][number]['verdict'], string> = {
  in_band: 'in band',
  low: 'below band',
  high: 'above band',
  no_band: 'no band set',
}

/** A site calendar date (`YYYY-MM-DD`) as "Sat 5 Dec"; noon UTC keeps it on its own day. */
export const dueDay = (date: string) => formatDay(`${date}T12:00:00Z`, 'UTC')

export function visitHeadline(visit: PublicVisit, clock: ClockStyle) {
  return `Service visit at ${visit.siteName}, ${formatZonedDateTime(visit.leftAt ?? visit.startsAt, visit.timeZone, clock)}`
}

export function timeOnSite(visit: PublicVisit, clock: ClockStyle) {
  if (!visit.arrivedAt || !visit.leftAt) return 'not recorded'
  const span = formatDuration(Date.parse(visit.leftAt) - Date.parse(visit.arrivedAt))
  return `${formatZonedDateTime(visit.arrivedAt, visit.timeZone, clock)} to ${formatZonedDateTime(visit.leftAt, visit.timeZone, clock)} (${span})`
}

export function readingLine(r: VisitTankWork['readings'][number]) {
  const unit = r.unit === 'pH' ? '' : ` ${r.unit}`
  return `${r.metric === 'ph' ? 'pH' : r.metric.replace('_', ' ')} ${r.value}${unit}: ${VERDICT_WORDS[r.verdict]}`
}

export function materialLines(visit: PublicVisit) {
  return visit.materials.map((m) => `${m.amount}${m.unit ? ` ${m.unit}` : ''} ${m.what}`)
}

export function nextLine(w: VisitTankWork) {
  return w.next.map((n) => `${n.title} on ${dueDay(n.dueDate)}`).join('; ') || 'nothing scheduled'
}
