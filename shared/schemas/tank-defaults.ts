import type { Targets, TankKind } from './tanks'

/**
 * Starting target bands by kind of tank. These are the trade's usual ranges
 * (`common practice`), meant to be edited per tank for its livestock.
 */
export const DEFAULT_TARGETS: Record<TankKind, Targets> = {
  tropical_freshwater: {
    temperature: { min: 24, max: 28 },
    ph: { min: 6.5, max: 7.5 },
    ammonia: { min: 0, max: 0.02 },
    nitrite: { min: 0, max: 0.1 },
    nitrate: { min: 0, max: 40 },
  },
  planted: {
    temperature: { min: 22, max: 28 },
    ph: { min: 6.0, max: 7.5 },
    ammonia: { min: 0, max: 0.02 },
    nitrite: { min: 0, max: 0.1 },
    nitrate: { min: 5, max: 30 },
  },
  coldwater: {
    temperature: { min: 10, max: 22 },
    ph: { min: 7.0, max: 8.0 },
    ammonia: { min: 0, max: 0.02 },
    nitrite: { min: 0, max: 0.1 },
    nitrate: { min: 0, max: 40 },
  },
  brackish: {
    temperature: { min: 24, max: 28 },
    ph: { min: 7.5, max: 8.5 },
    ammonia: { min: 0, max: 0.02 },
    nitrite: { min: 0, max: 0.1 },
    nitrate: { min: 0, max: 40 },
    // Mid-range brackish, stated at 25/25 °C; many brackish species want more or less.
    specific_gravity: { min: 1.005, max: 1.012 },
  },
  marine: {
    temperature: { min: 24, max: 27 },
    ph: { min: 8.0, max: 8.4 },
    ammonia: { min: 0, max: 0.02 },
    nitrite: { min: 0, max: 0.1 },
    nitrate: { min: 0, max: 10 },
    // Natural seawater is near 35; reef keepers hold calcium, alkalinity and magnesium near its levels.
    salinity: { min: 33.5, max: 35.5 },
    calcium: { min: 380, max: 450 },
    kh: { min: 7, max: 11 },
    magnesium: { min: 1250, max: 1400 },
    phosphate: { min: 0.02, max: 0.1 },
  },
}

export function defaultTargetsFor(kind: TankKind): Targets {
  return structuredClone(DEFAULT_TARGETS[kind])
}
