// Heater sizing and warm-up time for a tank of fresh water.
import { WATER_SPECIFIC_HEAT_KJ_PER_KG_K, waterDensityKgPerL } from './water-properties'
import { requirePositive, requirePositiveUpTo } from './validate'

/** common practice: about 1 W per litre holds a tank up to ~5 K above the room. */
const WATTS_PER_LITRE = 1
const RULE_DELTA_K = 5
/** Beyond this lift the room, lid and insulation matter more than any rule. */
const MAX_DELTA_K = 20
/** Density at the usual tropical-tank temperature; heating changes it by under 0.5 %. */
const REFERENCE_TEMP_C = 25

function validateLift(litres: number, deltaK: number): void {
  requirePositive('litres', litres)
  requirePositiveUpTo('deltaK', deltaK, MAX_DELTA_K, 'K')
}

/**
 * Rule-of-thumb heater rating (common practice): 1 W/L for a lift up to 5 K above the room,
 * scaled in proportion for larger lifts.
 */
export function heaterWattsRuleOfThumb(litres: number, deltaK: number): number {
  validateLift(litres, deltaK)
  return litres * WATTS_PER_LITRE * Math.max(1, deltaK / RULE_DELTA_K)
}

/** Energy (kJ) to raise the water by deltaK. */
export function energyToHeatKJ(litres: number, deltaK: number): number {
  validateLift(litres, deltaK)
  return litres * waterDensityKgPerL(REFERENCE_TEMP_C) * WATER_SPECIFIC_HEAT_KJ_PER_KG_K * deltaK
}

/**
 * Hours for a heater of `watts` to lift the water by deltaK, ignoring every loss (surface
 * evaporation, glass, lid): a lower bound, real tanks take longer and may never get there.
 */
export function hoursToHeat(litres: number, deltaK: number, watts: number): number {
  requirePositive('watts', watts)
  const kJ = energyToHeatKJ(litres, deltaK)
  return (kJ * 1000) / watts / 3600
}
