import { describe, expect, it } from 'vitest'
import { energyToHeatKJ, heaterWattsRuleOfThumb, hoursToHeat } from '@shared/chemistry/heater'
import { expectRelative, expectWithin } from './helpers'

describe('heaterWattsRuleOfThumb (common practice: ~1 W/L up to 5 K above the room)', () => {
  it.each([
    [100, 3, 100],
    [100, 5, 100],
    [100, 10, 200],
    [60, 7.5, 90],
  ])('%s L lifted %s K → %s W', (litres, deltaK, watts) => {
    expectWithin(heaterWattsRuleOfThumb(litres, deltaK), watts, 1e-9)
  })
})

describe('energyToHeatKJ', () => {
  // Hand-worked: 100 L × 0.997044 kg/L (CRC density at 25 °C, from memory)
  // × 4.1813 kJ/(kg·K) (CRC / NIST at 25 °C, from memory) × 1 K = 416.89 kJ.
  it.each([
    [100, 1, 416.89],
    [250, 4, 4168.9],
  ])('%s L by %s K → %s kJ (hand-worked)', (litres, deltaK, kJ) => {
    expectRelative(energyToHeatKJ(litres, deltaK), kJ, 0.0002)
  })

  // 1 kcal per kg per K (thermochemical calorie, 4.184 kJ): 99.7044 kg × 4.184 = 417.16 kJ.
  it('agrees within 0.1 % with 1 kcal per kg per K (thermochemical calorie, 4.184 kJ)', () => {
    expectRelative(energyToHeatKJ(100, 1), 417.16, 0.001)
  })
})

describe('hoursToHeat (losses ignored)', () => {
  // 833.79 kJ / (100 W × 3.6 kJ per W·h) = 2.316 h; 2501.4 kJ / (600 W × 3.6) = 1.158 h
  it.each([
    [100, 2, 100, 2.316],
    [200, 3, 600, 1.158],
  ])('%s L by %s K with %s W → %s h (hand-worked)', (litres, deltaK, watts, hours) => {
    expectWithin(hoursToHeat(litres, deltaK, watts), hours, 0.001)
  })
})

describe('input validation', () => {
  it.each([
    [() => heaterWattsRuleOfThumb(0, 3), /litres/],
    [() => heaterWattsRuleOfThumb(100, 0), /deltaK/],
    [() => heaterWattsRuleOfThumb(100, 25), /deltaK/],
    [() => energyToHeatKJ(-10, 2), /litres/],
    [() => hoursToHeat(100, 2, 0), /watts/],
  ])('rejects out-of-range input %#', (call, name) => {
    expect(call).toThrow(RangeError)
    expect(call).toThrow(name)
  })
})
