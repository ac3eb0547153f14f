import { describe, expect, it } from 'vitest'
import { filledWeightKg, footprintCm2, grossVolumeLitres, waterVolumeLitres, type TankShape } from '@shared/chemistry/volume'
import { expectWithin } from './helpers'

const rect: TankShape = { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 }
const cylinder: TankShape = { shape: 'cylinder', diameterCm: 50, heightCm: 100 }
const bow: TankShape = { shape: 'bow_front', lengthCm: 100, widthCm: 40, bowCm: 10, heightCm: 50 }
const semicircleBow: TankShape = { shape: 'bow_front', lengthCm: 60, widthCm: 30, bowCm: 30, heightCm: 40 }

describe('footprint and gross volume (hand-worked geometry)', () => {
  it.each([
    // 60 × 30 = 1800 cm²; × 36 cm = 64 800 cm³ = 64.8 L
    ['rectangular 60×30×36', rect, 1800, 64.8],
    // π × 25² = 1963.495 cm²; × 100 cm = 196.350 L
    ['cylinder Ø50×100', cylinder, 1963.495, 196.3495],
    // Bow: chord c = 100, sagitta s = 10. R = (c²/4 + s²)/(2s) = (2500 + 100)/20 = 130.
    // θ = 2·asin(50/130) = 0.789582 rad; sin θ = 2·(5/13)·(12/13) = 120/169 = 0.710059.
    // Segment = R²/2·(θ − sin θ) = 8450 × 0.079523 = 671.97 cm²; + 100 × 40 = 4671.97 cm².
    ['bow front 100×40 + 10', bow, 4671.97, 233.5985],
    // A bow of half its length is a semicircle: 60 × 30 + π·30²/2 = 1800 + 1413.717 cm².
    ['bow front semicircle', semicircleBow, 3213.717, 128.5487],
  ])('%s', (_label, shape, area, litres) => {
    expectWithin(footprintCm2(shape), area, 0.01)
    expectWithin(grossVolumeLitres(shape), litres, 0.001)
  })

  it('a shallow bow tends to the parabolic-segment area 2/3·c·s (Archimedes)', () => {
    const shallow: TankShape = { shape: 'bow_front', lengthCm: 100, widthCm: 40, bowCm: 0.5, heightCm: 50 }
    expectWithin(footprintCm2(shallow) - 4000, (2 / 3) * 100 * 0.5, 0.01)
  })
})

describe('waterVolumeLitres', () => {
  it.each([
    // 1800 cm² × (33 − 5) cm = 50 400 cm³
    [rect, 33, 5, 50.4],
    // default substrate 0: 1800 × 30
    [rect, 30, undefined, 54],
    // 4671.97 × (45 − 5) / 1000
    [bow, 45, 5, 186.8788],
  ])('hand-worked case %#', (shape, fill, substrate, litres) => {
    expectWithin(waterVolumeLitres(shape, fill, substrate), litres, 0.001)
  })

  it.each([
    [() => waterVolumeLitres(rect, 40), /fillHeightCm/],
    [() => waterVolumeLitres(rect, -1), /fillHeightCm/],
    [() => waterVolumeLitres(rect, 30, -2), /substrateDepthCm/],
    [() => waterVolumeLitres(rect, 30, 30), /substrateDepthCm/],
    [() => footprintCm2({ ...rect, lengthCm: 0 }), /lengthCm/],
    [() => footprintCm2({ ...rect, widthCm: -5 }), /widthCm/],
    [() => footprintCm2({ shape: 'cylinder', diameterCm: 0, heightCm: 10 }), /diameterCm/],
    [() => footprintCm2({ ...bow, bowCm: 0 }), /bowCm/],
    [() => footprintCm2({ ...bow, bowCm: 51 }), /bowCm/],
    [() => footprintCm2({ ...rect, heightCm: 0 }), /heightCm/],
    [() => footprintCm2({ shape: 'hexagon', heightCm: 10 } as unknown as TankShape), /shape/],
  ])('rejects bad input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})

describe('filledWeightKg', () => {
  it.each([
    // CRC Handbook density 0.997044 g/mL at 25 °C (from memory) → 99.704 kg per 100 L
    [100, 25, 99.7044, 'CRC Handbook, 25 °C, from memory'],
    // CRC Handbook 53rd ed. p. F-4: 0.999973 g/mL at 4 °C
    [100, 4, 99.9973, 'CRC Handbook 53rd ed. p. F-4'],
    // CRC Handbook 53rd ed. p. F-4: 0.999700 g/mL at 10 °C
    [250, 10, 249.925, 'CRC Handbook 53rd ed. p. F-4'],
  ])('%s L at %s °C → %s kg (%s)', (litres, tempC, kg) => {
    expectWithin(filledWeightKg(litres, tempC), kg, 0.0005 * (litres / 100))
  })

  it('defaults to 25 °C', () => {
    expect(filledWeightKg(100)).toBe(filledWeightKg(100, 25))
  })

  it('rejects negative litres and temperatures outside 0–40 °C', () => {
    expect(() => filledWeightKg(-1)).toThrow(/waterLitres/)
    expect(() => filledWeightKg(10, 50)).toThrow(/tempC/)
  })
})
