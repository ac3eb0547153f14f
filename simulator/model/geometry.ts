// The few shape facts the physics needs: water surface area, wall area, height.
import { footprintCm2 } from '@shared/chemistry/volume'
import type { SimTankSpec } from './spec'

/** Assumption: a tank without dimensions is 40 cm tall with a square footprint. */
export const DEFAULT_HEIGHT_CM = 40
/** Assumption: tanks run at 90 % of their height (the rest is rim and lid space). */
export const START_FILL_FRACTION = 0.9

export interface TankGeometry {
  heightCm: number
  /** Floor area = water surface area at any level (vertical walls). */
  footprintCm2: number
  /** Glass walls plus the top; the floor stands on a stand and is left out. */
  exposedAreaM2: number
}

function circularArcLength(chord: number, sagitta: number): number {
  const radius = (chord ** 2 / 4 + sagitta ** 2) / (2 * sagitta)
  return 2 * radius * Math.asin(Math.min(1, chord / (2 * radius)))
}

function perimeterCm(spec: SimTankSpec, footprint: number): number {
  const d = spec.dimensions
  if (!d) return 4 * Math.sqrt(footprint)
  switch (d.shape) {
    case 'rectangular':
      return 2 * (d.lengthCm + d.widthCm)
    case 'cylinder':
      return Math.PI * d.diameterCm
    case 'bow_front':
      return d.lengthCm + 2 * d.widthCm + circularArcLength(d.lengthCm, d.bowCm)
  }
}

export function tankGeometry(spec: SimTankSpec): TankGeometry {
  const heightCm = spec.dimensions?.heightCm ?? DEFAULT_HEIGHT_CM
  // Without dimensions, the entered volume is taken as the water at the usual fill.
  const footprint = spec.dimensions ? footprintCm2(spec.dimensions) : (spec.volumeLitres * 1000) / (heightCm * START_FILL_FRACTION)
  const wallsCm2 = perimeterCm(spec, footprint) * heightCm
  return { heightCm, footprintCm2: footprint, exposedAreaM2: (wallsCm2 + footprint) / 10_000 }
}

/** Litres of water standing `levelCm` deep over the footprint. */
export function litresAtLevel(geometry: TankGeometry, levelCm: number): number {
  return (geometry.footprintCm2 * Math.max(0, levelCm)) / 1000
}
