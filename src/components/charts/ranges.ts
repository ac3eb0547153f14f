export const RANGE_PRESETS = [
  { key: '6h', label: '6 h', hours: 6 },
  { key: '24h', label: '24 h', hours: 24 },
  { key: '7d', label: '7 d', hours: 7 * 24 },
  { key: '30d', label: '30 d', hours: 30 * 24 },
  { key: '1y', label: '1 y', hours: 365 * 24 },
] as const

export type PresetKey = (typeof RANGE_PRESETS)[number]['key']
export type RangeKey = PresetKey | 'custom'

export interface TimeRange {
  key: RangeKey
  from: Date
  to: Date
  /** Ends now, so live readings extend it. */
  live: boolean
}

/** How many points a chart asks for: enough detail for a wide screen, little enough to draw fast. */
export const CHART_POINTS = 600

export function presetRange(key: PresetKey, now = Date.now()): TimeRange {
  const preset = RANGE_PRESETS.find((p) => p.key === key) ?? RANGE_PRESETS[1]
  return { key, from: new Date(now - preset.hours * 3_600_000), to: new Date(now), live: true }
}

export function customRange(from: Date, to: Date, now = Date.now()): TimeRange {
  return { key: 'custom', from, to, live: to.getTime() >= now - 60_000 }
}

/** A message when a custom range cannot be asked for, else null (the server allows up to 400 days). */
export function customRangeProblem(from: Date | null, to: Date | null): string | null {
  if (!from || !to) return 'Enter both times'
  if (from.getTime() >= to.getTime()) return 'The start must be before the end'
  if (to.getTime() - from.getTime() > 400 * 24 * 3_600_000) return 'At most 400 days at a time'
  return null
}
