// Salt in a marine or brackish tank: evaporation leaves the salt behind and raises salinity, fresh
// top-up water brings it back, a water change swaps water for new water mixed to the nominal level.
import type { TankKind } from '@shared/schemas/tanks'
import { compensateTo25C } from '@shared/chemistry/conductivity'
import { conductivityFromSalinity, salinityFromConductivity } from '@shared/chemistry/salinity'

/** Practical salinity a tank of each kind is mixed to (assumptions: natural seawater, mid-range brackish). */
export const NOMINAL_SALINITY: Partial<Record<TankKind, number>> = { marine: 35, brackish: 12 }

/** A conductivity probe's noise, as a fraction of the reading (assumption). */
export const CONDUCTIVITY_NOISE_FRACTION = 0.002

export const hasSaltProbe = (kind: TankKind) => NOMINAL_SALINITY[kind] !== undefined

/** Salt held as salinity × litres, so it survives evaporation and top-ups unchanged. */
export interface SaltState {
  saltUnits: number
}

export function initialSaltState(kind: TankKind, litres: number): SaltState {
  return { saltUnits: (NOMINAL_SALINITY[kind] ?? 0) * litres }
}

/**
 * The salt after the water went from `beforeLitres` to `afterLitres`: a drain takes salt out with
 * the water, a water-change refill brings new water at the nominal salinity, evaporation and fresh
 * top-up water change nothing.
 */
export function stepSalt(state: SaltState, kind: TankKind, beforeLitres: number, afterLitres: number, waterChange: boolean): SaltState {
  if (!waterChange || beforeLitres <= 0) return state
  if (afterLitres < beforeLitres) return { saltUnits: state.saltUnits * (afterLitres / beforeLitres) }
  return { saltUnits: state.saltUnits + (afterLitres - beforeLitres) * (NOMINAL_SALINITY[kind] ?? 0) }
}

export const salinityOf = (state: SaltState, litres: number) => (litres > 0 ? state.saltUnits / litres : 0)

/**
 * What the probe reports: the practical salinity it computes from the conductivity it measures at
 * the water's temperature (PSS-78), and that conductivity referred to 25 °C, as the contract states it.
 */
export function probeReadings(salinity: number, waterC: number, noise: number): { conductivityUsCm: number; salinity: number } {
  const measured = conductivityFromSalinity(Math.min(42, salinity), waterC) * (1 + CONDUCTIVITY_NOISE_FRACTION * noise)
  return { conductivityUsCm: compensateTo25C(measured, waterC), salinity: salinityFromConductivity(measured, waterC) }
}
