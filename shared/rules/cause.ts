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

/**
 * The cause a trip of `metric` points to when nothing but its direction is known: cooling and
 * silence point to power, warming to heat, any other chemistry to the mains water. Each kind's
 * entry in shared/rules/kinds.ts says which way its trip went.
 */
export function causeOfMetric(metric: string, warming: boolean): CauseKey {
  switch (metric) {
    case 'temperature':
      return warming ? 'heat' : 'power'
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
