import { describe, expect, it } from 'vitest'
import type { TankShape } from '@shared/chemistry/volume'
import { hardscapeFigures, layerFigures, substrateFigures, waterLeftLitres } from '@shared/build'
import { expectWithin } from '../chemistry/helpers'

const tank60: TankShape = { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 }
const layers = [
  { material: 'mineral_base', depthCm: 1 },
  { material: 'nutrient_soil', depthCm: 4, bagLitres: 3 },
  { material: 'gravel', depthCm: 1, bagLitres: 2 },
]

describe('substrate layers (footprint × depth; densities from memory)', () => {
  it('works out each layer of a 60 × 30 cm tank', () => {
    // Footprint 60 × 30 = 1800 cm². Mineral base 1 cm: 1800 cm³ = 1.8 L × 1.2 kg/L (from memory) = 2.16 kg.
    // Nutrient soil 4 cm: 7.2 L × 0.9 kg/L (from memory) = 6.48 kg; 7.2 / 3 L bags = 2.4 → 3 bags.
    // Gravel 1 cm: 1.8 L × 1.6 kg/L (from memory) = 2.88 kg; 1.8 / 2 L bags = 0.9 → 1 bag.
    const bed = substrateFigures(tank60, layers)
    expect(bed.layers.map((l) => l.bags)).toEqual([null, 3, 1])
    expectWithin(bed.layers[0]!.litres, 1.8, 1e-9)
    expectWithin(bed.layers[0]!.kg, 2.16, 1e-9)
    expectWithin(bed.layers[1]!.kg, 6.48, 1e-9)
    expectWithin(bed.layers[2]!.kg, 2.88, 1e-9)
    // Bed: 6 cm, 10.8 L, 11.52 kg.
    expect(bed.depthCm).toBe(6)
    expectWithin(bed.litres, 10.8, 1e-9)
    expectWithin(bed.kg, 11.52, 1e-9)
  })

  it('counts an exact number of bags as that many, and takes a density from the bag', () => {
    // 1800 cm² × 5 cm = 9 L: three 3 L bags, not four. 9 L × 1.45 kg/L = 13.05 kg.
    const layer = layerFigures(tank60, { material: 'house_mix', depthCm: 5, bagLitres: 3, densityKgPerL: 1.45 })
    expect(layer.bags).toBe(3)
    expectWithin(layer.kg, 13.05, 1e-9)
  })

  it('uses the shared footprint for a cylinder: π·25² × 2 cm = 3.927 L', () => {
    const bed = substrateFigures({ shape: 'cylinder', diameterCm: 50, heightCm: 60 }, [{ material: 'sand', depthCm: 2 }])
    expectWithin(bed.litres, 3.92699, 1e-5)
  })

  it('refuses an unknown material without a density, and a bed as deep as the tank', () => {
    expect(() => layerFigures(tank60, { material: 'moon_dust', depthCm: 2 })).toThrow(/^material/)
    expect(() => layerFigures(tank60, { material: 'sand', depthCm: 0 })).toThrow(/^depthCm/)
    expect(() => substrateFigures(tank60, [{ material: 'sand', depthCm: 36 }])).toThrow(/^depthCm/)
  })
})

describe('hardscape and the water left', () => {
  it('turns weight into displaced litres and litres into weight', () => {
    // Rock 5 kg / 2.6 kg/L (from memory) = 1.923 L; wood 1 L × 1.1 kg/L (from memory) = 1.1 kg.
    const scape = hardscapeFigures([
      { kind: 'rock', kg: 5 },
      { kind: 'wood', litres: 1, label: 'Root' },
    ])
    expectWithin(scape.items[0]!.litres, 1.92308, 1e-5)
    expectWithin(scape.items[1]!.kg, 1.1, 1e-9)
    expect(scape.items[1]!.label).toBe('Root')
    expectWithin(scape.kg, 6.1, 1e-9)
    expectWithin(scape.litres, 2.92308, 1e-5)
    expect(() => hardscapeFigures([{ kind: 'rock' }])).toThrow(/^kg/)
  })

  it('leaves 47.48 L in a 60 × 30 × 36 cm tank filled to 34 cm over 6 cm of substrate and 2.92 L of hardscape', () => {
    // 1800 cm² × (34 − 6) cm = 50 400 cm³ = 50.4 L; less 2.923 L of hardscape = 47.477 L.
    expectWithin(waterLeftLitres(tank60, 34, 6, 2.92308), 47.47692, 1e-5)
    expectWithin(waterLeftLitres(tank60, 34, 6), 50.4, 1e-9)
    expect(() => waterLeftLitres(tank60, 34, 6, 60)).toThrow(/^hardscapeLitres/)
    expect(() => waterLeftLitres(tank60, 34, 34)).toThrow(/^substrateDepthCm/)
  })
})
