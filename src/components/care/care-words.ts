// Plain-English words, icons and colours for care screens; status is never told by colour alone.
import { CARE_TASK_KIND_TITLES, type CareTaskKind } from '@shared/care/defaults'
import { byUrgency, type CareDue, type CareDueStatus, type CareRecurrence } from '@shared/care/due'
import type { CareLogKind } from '@shared/schemas/care'
import { formatDay } from '@shared/time'

export interface StatusLook {
  word: string
  icon: string
  color: string
}

export const DUE_STATUS_LOOKS: Record<CareDueStatus, StatusLook> = {
  overdue: { word: 'Overdue', icon: 'mdi-alert-circle', color: 'alarm' },
  due_today: { word: 'Due today', icon: 'mdi-calendar-today', color: 'watch' },
  due_soon: { word: 'Due soon', icon: 'mdi-calendar-clock', color: 'info' },
  later: { word: 'Later', icon: 'mdi-calendar-check', color: 'steady' },
}

export const SWITCHED_OFF_LOOK: StatusLook = { word: 'Switched off', icon: 'mdi-pause-circle-outline', color: 'quiet' }

/** A `YYYY-MM-DD` calendar date as "Tue 3 Mar"; noon UTC keeps it the same day whatever the zone. */
export function formatLocalDay(date: string): string {
  return formatDay(`${date}T12:00:00Z`, 'UTC')
}

const days = (n: number) => `${n} day${n === 1 ? '' : 's'}`

/** "overdue by 3 days", "due today", "due tomorrow", "due in 5 days (Tue 3 Mar)". */
export function dueDetail(due: CareDue): string {
  if (due.daysUntilDue < 0) return `overdue by ${days(-due.daysUntilDue)} (was due ${formatLocalDay(due.dueOn)})`
  if (due.daysUntilDue === 0) return 'due today'
  if (due.daysUntilDue === 1) return `due tomorrow (${formatLocalDay(due.dueOn)})`
  return `due in ${days(due.daysUntilDue)} (${formatLocalDay(due.dueOn)})`
}

export const CARE_TASK_KIND_LABELS: Record<CareTaskKind, string> = {
  water_change: 'Water change',
  filter_rinse: 'Filter rinse',
  media_replace: 'Filter media replacement',
  glass_clean: 'Glass cleaning',
  substrate_clean: 'Substrate cleaning',
  test_kit_check: 'Test-kit check',
  equipment_service: 'Equipment service',
  treatment_dose: 'Treatment dose',
  treatment_test: 'Test during a treatment',
  other: 'Other',
}
export { CARE_TASK_KIND_TITLES }

/** 0 = Monday … 6 = Sunday, as the server counts them. */
export const WEEKDAY_NAMES = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const
export const WEEKDAY_SHORT = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'] as const

export function recurrenceText(recurrence: CareRecurrence): string {
  if (recurrence.kind === 'interval') {
    if (recurrence.everyDays === 1) return 'Every day'
    if (recurrence.everyDays === 7) return 'Every week'
    return `Every ${recurrence.everyDays} days`
  }
  if (recurrence.weekdays.length === 7) return 'Every day'
  return `Every ${recurrence.weekdays.map((d) => WEEKDAY_SHORT[d]).join(', ')}`
}

export const CARE_LOG_KIND_LABELS: Record<CareLogKind, string> = {
  water_change: 'Water change',
  dosing: 'Dosing',
  livestock_in: 'Livestock in',
  livestock_out: 'Livestock out',
  equipment: 'Equipment',
  media_change: 'Filter media',
  note: 'Note',
  task_done: 'Task done',
}

export const CARE_LOG_KIND_ICONS: Record<CareLogKind, string> = {
  water_change: 'mdi-water-sync',
  dosing: 'mdi-eyedropper',
  livestock_in: 'mdi-fish',
  livestock_out: 'mdi-fish-off',
  equipment: 'mdi-wrench-outline',
  media_change: 'mdi-filter-outline',
  note: 'mdi-note-text-outline',
  task_done: 'mdi-check-circle-outline',
}

/** Value keys the server writes, in words; anything else is shown under its own key. */
const VALUE_UNITS: Record<string, string> = {
  litres: 'L',
  percent: '%',
  dechlorinatorMl: 'mL dechlorinator',
  newWaterTempC: '°C new water',
  count: 'animals or plants',
  losses: 'lost',
}
const HIDDEN_VALUE_KEYS = new Set(['taskKind', 'livestockId', 'equipmentId', 'speciesKey', 'category', 'unit'])

const shownValue = (value: number | string | boolean) =>
  typeof value === 'number' ? String(Number(value.toFixed(2))) : typeof value === 'boolean' ? (value ? 'yes' : 'no') : value

/** "20 L · 10 %", "Conditioner · 5 mL"; bookkeeping keys are left out. */
export function valuesText(values: Record<string, number | string | boolean>): string {
  return Object.entries(values)
    .filter(([key]) => !HIDDEN_VALUE_KEYS.has(key))
    .map(([key, value]) => {
      const shown = shownValue(value)
      if (key === 'product') return shown
      if (key === 'amount') return typeof values.unit === 'string' ? `${shown} ${values.unit}` : shown
      const unit = VALUE_UNITS[key]
      return unit ? `${shown} ${unit}` : `${key}: ${shown}`
    })
    .join(' · ')
}

/**
 * Overdue first (longest overdue first), then due today, soon, later; switched-off tasks last.
 * The sort is stable, so ties keep the server's order (by tank name).
 */
export function urgentFirst<T extends { due: CareDue | null }>(tasks: readonly T[]): T[] {
  return [...tasks].sort((a, b) => {
    if (!a.due || !b.due) return Number(!a.due) - Number(!b.due)
    return byUrgency(a.due, b.due)
  })
}

export { plainNumber } from '@shared/plain-number'
