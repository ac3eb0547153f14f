import type { TankState } from './schemas/tank-status'
import type { Targets } from './schemas/tanks'

export type TankStateInput = {
  latest: Partial<Record<string, { value: number }>>
  targets: Targets
  /** Open incidents of the tank (their severity). */
  openIncidents: Array<{ severity: 'warning' | 'alarm'; title: string }>
  /** Devices of the tank that are overdue by more than three intervals. */
  quietDevices: string[]
  hasDevices: boolean
}

/** Share of the band's width counted as "near a limit". */
export const NEAR_LIMIT_FRACTION = 0.1

/**
 * A tank's state for the wall, in order of precedence: `alarm` (an alarm incident open),
 * `quiet` (a device that should report has gone silent), `watch` (a warning open, or a
 * value outside or near the edge of its band), `no_sensor` (no device and no reading at all, so
 * nothing is known about the water), otherwise `steady`.
 */
export function tankState(input: TankStateInput): { state: TankState; reasons: string[] } {
  const alarms = input.openIncidents.filter((i) => i.severity === 'alarm')
  if (alarms.length) return { state: 'alarm', reasons: alarms.map((i) => i.title) }
  if (input.quietDevices.length) {
    return { state: 'quiet', reasons: input.quietDevices.map((name) => `${name} has not reported`) }
  }
  const reasons = input.openIncidents.map((i) => i.title)
  for (const [metric, band] of Object.entries(input.targets)) {
    const current = input.latest[metric]?.value
    if (current === undefined || !band) continue
    const margin = (band.max - band.min) * NEAR_LIMIT_FRACTION
    if (current < band.min || current > band.max) reasons.push(`${metric} ${current} outside ${band.min}–${band.max}`)
    // A lower edge of zero (ammonia, nitrite) is where a tank should be, not a warning.
    else if (margin > 0 && ((band.min > 0 && current < band.min + margin) || current > band.max - margin))
      reasons.push(`${metric} ${current} near the edge of ${band.min}–${band.max}`)
  }
  if (reasons.length) return { state: 'watch', reasons }
  const hasReadings = Object.values(input.latest).some((v) => v !== undefined)
  if (!input.hasDevices && !hasReadings) return { state: 'no_sensor', reasons: ['No sensor and no test-kit entry'] }
  return { state: 'steady', reasons: [] }
}

const ORDER: Record<TankState, number> = { alarm: 0, watch: 1, quiet: 2, no_sensor: 3, steady: 4 }

/** Wall order: alarm first, then watch, then quiet, then tanks without a sensor, then the site's chosen order. */
export function compareForWall(a: { state: TankState; sortOrder: number; name: string }, b: typeof a): number {
  return ORDER[a.state] - ORDER[b.state] || a.sortOrder - b.sortOrder || a.name.localeCompare(b.name)
}
