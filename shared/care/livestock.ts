// Stocking checks for one addition to one tank, the post-addition watch, and quarantine time.
import { plainNumber } from '../plain-number'
import type { Species } from './species'

export type StockingWarningCode = 'temperature_outside_range' | 'ph_outside_range' | 'water_type' | 'tank_cycling' | 'tank_empty'

export interface StockingWarning {
  code: StockingWarningCode
  message: string
}

type Band = { min: number; max: number }

export interface StockingTank {
  kind: string
  stage: string
  targets: { temperature?: Band; ph?: Band }
}

/** common practice: watch new arrivals closely for a few days; three is our default. */
export const WATCH_PERIOD_DAYS = 3
/** common practice: quarantine lasts about four weeks. */
export const QUARANTINE_DAYS = 28

const DAY_MS = 86_400_000
const plain = (n: number) => plainNumber(n, 2)
const band = (b: Band, unit: string) => `${plain(b.min)}–${plain(b.max)}${unit}`
const inside = (inner: Band, outer: Band) => inner.min >= outer.min && inner.max <= outer.max

/**
 * What a keeper should hear before adding `species` (when known) to `tank`: a target band that
 * reaches outside the species' usual range, fresh and marine mixed up, and animals going into
 * a tank that is still cycling (ammonia and nitrite are not yet kept at zero). Plants are fine
 * in a cycling tank. Brackish tanks get no water-type check: many species tolerate them.
 */
export function stockingWarnings(tank: StockingTank, species: Species | undefined, category: Species['category']): StockingWarning[] {
  const warnings: StockingWarning[] = []
  const animal = category !== 'plant'
  if (tank.stage === 'empty') warnings.push({ code: 'tank_empty', message: 'The tank is marked empty' })
  if (animal && tank.stage === 'cycling') {
    warnings.push({
      code: 'tank_cycling',
      message: 'The tank is still cycling: ammonia and nitrite can harm animals until it is cycled',
    })
  }
  if (!species) return warnings
  const name = species.commonName
  const temperature = tank.targets.temperature
  if (temperature && !inside(temperature, species.temperatureC)) {
    warnings.push({
      code: 'temperature_outside_range',
      message: `The tank's target ${band(temperature, ' °C')} reaches outside the usual ${band(species.temperatureC, ' °C')} for ${name}`,
    })
  }
  const ph = tank.targets.ph
  if (ph && !inside(ph, species.ph)) {
    warnings.push({
      code: 'ph_outside_range',
      message: `The tank's target pH ${band(ph, '')} reaches outside the usual pH ${band(species.ph, '')} for ${name}`,
    })
  }
  const tankWater = tank.kind === 'marine' ? 'marine' : tank.kind === 'brackish' ? null : 'fresh'
  if (tankWater && tankWater !== species.water) {
    warnings.push({
      code: 'water_type',
      message: `${name} is a ${species.water === 'marine' ? 'marine' : 'freshwater'} species; this is a ${tankWater === 'marine' ? 'marine' : 'freshwater'} tank`,
    })
  }
  return warnings
}

/** End of the close-watch period after animals go in. */
export function watchUntil(addedAt: Date, days = WATCH_PERIOD_DAYS): Date {
  return new Date(addedAt.getTime() + days * DAY_MS)
}

export interface QuarantineStatus {
  startedAt: string | null
  endsAt: string | null
  /** Whole days since it started, rounded down (day 0 is the first day); null when not started. */
  daysIn: number | null
  /** Whole days left, rounded up; 0 once over; null when not started. */
  daysRemaining: number | null
  days: number
}

/** Quarantine runs `days` from when it started: when the tank was set to the quarantine stage. */
export function quarantineStatus(startedAt: Date | null, now: Date, days = QUARANTINE_DAYS): QuarantineStatus {
  if (!startedAt) return { startedAt: null, endsAt: null, daysIn: null, daysRemaining: null, days }
  const ends = startedAt.getTime() + days * DAY_MS
  const daysIn = Math.max(0, Math.floor((now.getTime() - startedAt.getTime()) / DAY_MS))
  const daysRemaining = Math.max(0, Math.ceil((ends - now.getTime()) / DAY_MS))
  return { startedAt: startedAt.toISOString(), endsAt: new Date(ends).toISOString(), daysIn, daysRemaining, days }
}
