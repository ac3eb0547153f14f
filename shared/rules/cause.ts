import type { WatchRuleSpec } from './schema'
import { metricOfSpec } from './kinds'

/**
 * The kind of cause a trip points to, so that several tanks of one site tripping on the same
 * kind at once read as one site-wide fault: a power cut cools tanks, silences devices and stops
 * air pumps; a mains-water problem moves the chemistry of every tank that was changed.
 */
export type CauseKey = 'power' | 'heat' | 'water' | 'water_level' | 'light'

export const CAUSE_TITLES: Record<CauseKey, string> = {
  power: 'Several tanks cooling or silent at once: a power cut?',
  heat: 'Several tanks warming at once',
  water: 'Water chemistry moving in several tanks: the mains water?',
  water_level: 'Water level falling in several tanks',
  light: 'Lights off their schedule in several tanks',
}

/** `value` is the compared quantity of the trip (see RuleEvent): it tells a cold trip from a hot one. */
export function causeOf(spec: WatchRuleSpec, value: number): CauseKey | undefined {
  // A probe's own fault says nothing about the site.
  if (spec.kind === 'probe_kit' || spec.kind === 'stuck') return undefined
  if (spec.kind === 'quiet') return 'power'
  const metric = metricOfSpec(spec)
  switch (metric) {
    case 'temperature':
      if (spec.kind === 'above') return 'heat'
      if (spec.kind === 'outside') return value > spec.max ? 'heat' : 'power'
      if (spec.kind === 'rate') return value > 0 ? 'heat' : 'power'
      return 'power'
    case 'oxygen':
      return 'power'
    case 'water_level':
      return 'water_level'
    case 'light':
      return 'light'
    default:
      return 'water'
  }
}
