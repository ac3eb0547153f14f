// The filled tank's weight on its stand: glass, water, wet substrate and hardscape.
import { filledWeightKg, footprintCm2, type TankShape } from '../chemistry/volume'
import { requirePositive } from '../chemistry/validate'
import { GLASS_DENSITY_KG_PER_L, SUBSTRATE_POROSITY } from './materials'

/** Bow front: the arc of the circular segment, R·θ with R and θ as in volume.ts. */
function bowArcCm(chord: number, sagitta: number): number {
  const radius = (chord ** 2 / 4 + sagitta ** 2) / (2 * sagitta)
  const theta = 2 * Math.asin(Math.min(1, chord / (2 * radius)))
  return radius * theta
}

/**
 * Glass area of an open-topped tank in cm², from the inside dimensions: the base and the walls
 * to full height. Outside sizes are a glass thickness larger, so this errs a little light.
 */
export function glassAreaCm2(shape: TankShape): number {
  const h = shape.heightCm
  const base = footprintCm2(shape)
  switch (shape.shape) {
    case 'rectangular':
      return base + 2 * shape.lengthCm * h + 2 * shape.widthCm * h
    case 'cylinder':
      return base + Math.PI * shape.diameterCm * h
    case 'bow_front':
      return base + shape.lengthCm * h + 2 * shape.widthCm * h + bowArcCm(shape.lengthCm, shape.bowCm) * h
  }
}

export function glassKg(shape: TankShape, thicknessMm: number): number {
  requirePositive('glassThicknessMm', thicknessMm)
  const litres = (glassAreaCm2(shape) * (thicknessMm / 10)) / 1000
  return litres * GLASS_DENSITY_KG_PER_L
}

export interface FilledWeightInput {
  shape: TankShape
  glassThicknessMm: number
  waterLitres: number
  substrateLitres: number
  substrateKg: number
  hardscapeKg: number
}

export interface FilledWeight {
  glassKg: number
  waterKg: number
  /** Dry substrate plus the water held in its pores (SUBSTRATE_POROSITY of its volume). */
  substrateKg: number
  hardscapeKg: number
  totalKg: number
  /** Spread over the tank's own footprint; a stand's feet concentrate it further. */
  loadKgPerM2: number
}

/** Water at 25 °C (shared/chemistry's density); cabinet, lid, light and filter come on top. */
export function filledTankWeight(input: FilledWeightInput): FilledWeight {
  const glass = glassKg(input.shape, input.glassThicknessMm)
  const water = filledWeightKg(input.waterLitres)
  const substrate = input.substrateKg + input.substrateLitres * SUBSTRATE_POROSITY * filledWeightKg(1)
  const totalKg = glass + water + substrate + input.hardscapeKg
  return {
    glassKg: glass,
    waterKg: water,
    substrateKg: substrate,
    hardscapeKg: input.hardscapeKg,
    totalKg,
    loadKgPerM2: totalKg / (footprintCm2(input.shape) / 10_000),
  }
}

export const WEIGHT_CAUTIONS = [
  'A filled tank is very heavy: stand it on a level stand rated for the total weight, on a floor that can carry it',
  'Check the floor loading, especially upstairs or on a suspended floor; ask a structural engineer when unsure',
]
