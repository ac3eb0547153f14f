// Hardscape and the water left once substrate and hardscape are in.
import { waterVolumeLitres, type TankShape } from '../chemistry/volume'
import { requireNonNegative, requirePositive } from '../chemistry/validate'
import { HARDSCAPE_DENSITY_KG_PER_L, type HardscapeKind } from './materials'

/** A piece or a lot of wood or rock, known by its weight or by the water it displaces. */
export interface HardscapeItem {
  kind: HardscapeKind
  label?: string
  kg?: number
  litres?: number
}

export interface HardscapeFigures {
  items: Array<{ kind: HardscapeKind; label: string; kg: number; litres: number }>
  kg: number
  litres: number
}

export function hardscapeFigures(items: readonly HardscapeItem[]): HardscapeFigures {
  const rows = items.map((item) => {
    const density = HARDSCAPE_DENSITY_KG_PER_L[item.kind]
    if (density === undefined) throw new RangeError(`kind must be rock or wood (got ${String(item.kind)})`)
    if (item.kg !== undefined) {
      requirePositive('kg', item.kg)
      return { kind: item.kind, label: item.label ?? item.kind, kg: item.kg, litres: item.litres ?? item.kg / density }
    }
    if (item.litres === undefined) throw new RangeError('kg: give the weight or the volume of each piece')
    requirePositive('litres', item.litres)
    return { kind: item.kind, label: item.label ?? item.kind, kg: item.litres * density, litres: item.litres }
  })
  return { items: rows, kg: rows.reduce((t, r) => t + r.kg, 0), litres: rows.reduce((t, r) => t + r.litres, 0) }
}

/**
 * Open water once the tank is filled to `fillHeightCm`: the one volume formula above the
 * substrate (shared/chemistry/volume's waterVolumeLitres, which the water-change planner uses
 * with the tank's substrate depth) less what the hardscape displaces.
 */
export function waterLeftLitres(shape: TankShape, fillHeightCm: number, substrateDepthCm: number, hardscapeLitres = 0): number {
  requireNonNegative('hardscapeLitres', hardscapeLitres)
  const above = waterVolumeLitres(shape, fillHeightCm, substrateDepthCm)
  if (hardscapeLitres >= above) throw new RangeError(`hardscapeLitres: ${hardscapeLitres} L of hardscape leaves no water in ${above.toFixed(1)} L`)
  return above - hardscapeLitres
}
