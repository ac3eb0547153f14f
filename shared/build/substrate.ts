// Substrate layers from the tank's footprint: litres, mass and bags of each layer.
import { footprintCm2, type TankShape } from '../chemistry/volume'
import { requirePositive } from '../chemistry/validate'
import { substrateMaterial } from './materials'

export interface SubstrateLayer {
  material: string
  depthCm: number
  /** Overrides the material's density, e.g. from the bag's own figure. */
  densityKgPerL?: number
  /** Litres per bag of the product chosen; no bag count without it. */
  bagLitres?: number
}

export interface LayerFigures {
  material: string
  depthCm: number
  litres: number
  kg: number
  densityKgPerL: number
  bags: number | null
}

export interface SubstrateFigures {
  layers: LayerFigures[]
  depthCm: number
  litres: number
  kg: number
}

function densityOf(layer: SubstrateLayer): number {
  if (layer.densityKgPerL !== undefined) {
    requirePositive('densityKgPerL', layer.densityKgPerL)
    return layer.densityKgPerL
  }
  const material = substrateMaterial(layer.material)
  if (!material) throw new RangeError(`material must be a known substrate or come with densityKgPerL (got ${layer.material})`)
  return material.bulkDensityKgPerL
}

/** One level layer over the whole floor: footprint × depth; bags rounded up (a part bag is a bag bought). */
export function layerFigures(shape: TankShape, layer: SubstrateLayer): LayerFigures {
  requirePositive('depthCm', layer.depthCm)
  const litres = (footprintCm2(shape) * layer.depthCm) / 1000
  const densityKgPerL = densityOf(layer)
  let bags: number | null = null
  if (layer.bagLitres !== undefined) {
    requirePositive('bagLitres', layer.bagLitres)
    // A hair over a whole bag from rounding (e.g. 9.0000001 L of 3 L bags) is still three bags.
    bags = Math.ceil(litres / layer.bagLitres - 1e-9)
  }
  return { material: layer.material, depthCm: layer.depthCm, litres, kg: litres * densityKgPerL, densityKgPerL, bags }
}

/** Every layer, and the bed as a whole; its depth is what the water-change planner stands on. */
export function substrateFigures(shape: TankShape, layers: readonly SubstrateLayer[]): SubstrateFigures {
  const figures = layers.map((layer) => layerFigures(shape, layer))
  const sum = (pick: (l: LayerFigures) => number) => figures.reduce((total, l) => total + pick(l), 0)
  const depthCm = sum((l) => l.depthCm)
  if (depthCm >= shape.heightCm) throw new RangeError(`depthCm: the layers add up to ${depthCm} cm, not less than the tank's ${shape.heightCm} cm`)
  return { layers: figures, depthCm, litres: sum((l) => l.litres), kg: sum((l) => l.kg) }
}
