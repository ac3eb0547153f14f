// Tank geometry from inside dimensions (glass thickness is the caller's concern).
import { waterDensityKgPerL } from './water-properties'
import { requireNonNegative, requirePositive } from './validate'

export type TankShape =
  | { shape: 'rectangular'; lengthCm: number; widthCm: number; heightCm: number }
  | { shape: 'cylinder'; diameterCm: number; heightCm: number }
  | {
      shape: 'bow_front'
      lengthCm: number
      /** depth front-to-back at the side panels */
      widthCm: number
      /** extra depth at the centre of the bow, beyond widthCm */
      bowCm: number
      heightCm: number
    }

/**
 * Area of a circular segment with chord `chord` and height (sagitta) `sagitta`.
 * Radius from the intersecting-chords theorem: R = (c²/4 + s²) / (2s);
 * central angle θ = 2·asin(c / 2R); area = R²/2 · (θ − sin θ).
 */
function circularSegmentArea(chord: number, sagitta: number): number {
  const radius = (chord ** 2 / 4 + sagitta ** 2) / (2 * sagitta)
  const theta = 2 * Math.asin(Math.min(1, chord / (2 * radius)))
  return (radius ** 2 / 2) * (theta - Math.sin(theta))
}

function validateShape(shape: TankShape): void {
  requirePositive('heightCm', shape.heightCm)
  switch (shape.shape) {
    case 'rectangular':
      requirePositive('lengthCm', shape.lengthCm)
      requirePositive('widthCm', shape.widthCm)
      return
    case 'cylinder':
      requirePositive('diameterCm', shape.diameterCm)
      return
    case 'bow_front':
      requirePositive('lengthCm', shape.lengthCm)
      requirePositive('widthCm', shape.widthCm)
      requirePositive('bowCm', shape.bowCm)
      // A bow deeper than half its chord would bulge past a semicircle; no real tank does.
      if (shape.bowCm > shape.lengthCm / 2) {
        throw new RangeError(`bowCm must not exceed half of lengthCm (got ${shape.bowCm} for length ${shape.lengthCm})`)
      }
      return
    default: {
      const unknown: never = shape
      throw new RangeError(`shape must be rectangular, cylinder or bow_front (got ${JSON.stringify(unknown)})`)
    }
  }
}

/**
 * Floor area in cm². The walls are vertical, so this is also the area of the water surface
 * at any level, which is what turns litres into centimetres of level.
 *
 * Bow front: approximated as a rectangle (length × side depth) plus a circular segment whose
 * chord is the full length and whose height is the bow. Real bows are often flatter near the
 * corners; the approximation is good to a few percent of the bow's own area.
 */
export function footprintCm2(shape: TankShape): number {
  validateShape(shape)
  switch (shape.shape) {
    case 'rectangular':
      return shape.lengthCm * shape.widthCm
    case 'cylinder':
      return (Math.PI * shape.diameterCm ** 2) / 4
    case 'bow_front':
      return shape.lengthCm * shape.widthCm + circularSegmentArea(shape.lengthCm, shape.bowCm)
  }
}

/** Volume to the rim in litres (1 L = 1000 cm³). */
export function grossVolumeLitres(shape: TankShape): number {
  return (footprintCm2(shape) * shape.heightCm) / 1000
}

/**
 * Litres of water above a level substrate bed. Water held in the substrate's pores is ignored
 * (it does not take part in a water change and dosing labels assume open water).
 */
export function waterVolumeLitres(shape: TankShape, fillHeightCm: number, substrateDepthCm = 0): number {
  const area = footprintCm2(shape)
  requirePositive('fillHeightCm', fillHeightCm)
  requireNonNegative('substrateDepthCm', substrateDepthCm)
  if (fillHeightCm > shape.heightCm) {
    throw new RangeError(`fillHeightCm must not exceed the tank's heightCm ${shape.heightCm} (got ${fillHeightCm})`)
  }
  if (substrateDepthCm >= fillHeightCm) {
    throw new RangeError(`substrateDepthCm must be less than fillHeightCm ${fillHeightCm} (got ${substrateDepthCm})`)
  }
  return (area * (fillHeightCm - substrateDepthCm)) / 1000
}

/** Mass of the water alone in kg; glass, stand, rock and substrate come on top. */
export function filledWeightKg(waterLitres: number, tempC = 25): number {
  requireNonNegative('waterLitres', waterLitres)
  return waterLitres * waterDensityKgPerL(tempC)
}
