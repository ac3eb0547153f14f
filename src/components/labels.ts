import type { Role } from '@shared/schemas/auth'
import { METRICS, displayPrecision, type MetricKey } from '@shared/metrics/registry'
import { displayUnitOf, toDisplayValue, unitLabel } from '@/composables/useUnits'
import { formatZonedDateTime } from '@shared/time'

export const ROLE_LABELS: Record<Role, string> = {
  owner: 'Owner',
  keeper: 'Keeper',
  viewer: 'Viewer',
}

export const ROLE_HINTS: Record<Role, string> = {
  owner: 'Everything, including sites and people',
  keeper: 'Adds and edits tanks, later test-kit entries and care',
  viewer: 'Reads only, optionally limited to some sites',
}

export const SHAPE_LABELS = {
  rectangular: 'Rectangular',
  cylinder: 'Cylinder',
  bow_front: 'Bow front',
} as const

const numberFormats = new Map<number, Intl.NumberFormat>()

/** Fixed decimals, grouped thousands; a dash when there is nothing to show. */
export function formatNumber(value: number | null | undefined, decimals = 0): string {
  if (value == null || !Number.isFinite(value)) return '—'
  let format = numberFormats.get(decimals)
  if (!format) {
    format = new Intl.NumberFormat('en', { minimumFractionDigits: decimals, maximumFractionDigits: decimals })
    numberFormats.set(decimals, format)
  }
  return format.format(value)
}

export function metricLabel(key: MetricKey): string {
  return METRICS[key].label
}

export function metricUnit(key: MetricKey): string {
  return METRICS[key].unitLabel
}

export function formatBand(key: MetricKey, band: { min: number; max: number } | undefined): string {
  if (!band) return '—'
  // Shown in the person's unit (°F for some); stored and edited canonically.
  const unitCode = displayUnitOf(key)
  const precision = displayPrecision(key, unitCode)
  const unit = unitLabel(key, unitCode)
  const suffix = unit === 'pH' ? '' : ` ${unit}`
  return `${formatNumber(toDisplayValue(key, band.min), precision)} – ${formatNumber(toDisplayValue(key, band.max), precision)}${suffix}`
}

/** A date and time naming its zone: the site's when given, else the viewer's own. */
export function formatDate(iso: string | null | undefined, timeZone?: string): string {
  return formatZonedDateTime(iso, timeZone)
}
