import { describe, expect, it } from 'vitest'
import type { TankShape } from '@shared/chemistry/volume'
import { conditionerDose, filledTankWeight, glassAreaCm2, glassKg, heaterTopMaxCm, suggestHeaterWatts } from '@shared/build'
import { expectWithin } from '../chemistry/helpers'

const tank60: TankShape = { shape: 'rectangular', lengthCm: 60, widthCm: 30, heightCm: 36 }

describe('glass and the filled weight', () => {
  it('weighs the glass of an open 60 × 30 × 36 cm tank in 6 mm glass', () => {
    // Base 60 × 30 = 1800; long sides 2 × 60 × 36 = 4320; ends 2 × 30 × 36 = 2160: 8280 cm².
    // × 0.6 cm = 4968 cm³ = 4.968 L × 2.5 kg/L (soda-lime glass, from memory) = 12.42 kg.
    expect(glassAreaCm2(tank60)).toBe(8280)
    expectWithin(glassKg(tank60, 6), 12.42, 1e-9)
  })

  it('adds the glass of a cylinder wall and a bow front', () => {
    // Cylinder Ø40 × 50: base π·20² = 1256.64; wall π·40·50 = 6283.19 → 7539.82 cm².
    expectWithin(glassAreaCm2({ shape: 'cylinder', diameterCm: 40, heightCm: 50 }), 7539.82, 0.01)
    // Semicircular bow 60 × 30 + 30, height 40: footprint 1800 + π·30²/2 = 3213.72; back 2400;
    // sides 2 × 30 × 40 = 2400; arc π·30 = 94.248 × 40 = 3769.91 → 11 783.63 cm².
    expectWithin(glassAreaCm2({ shape: 'bow_front', lengthCm: 60, widthCm: 30, bowCm: 30, heightCm: 40 }), 11783.63, 0.01)
  })

  it('totals glass, water, wet substrate and hardscape', () => {
    // Water 47.477 L × 0.997044 kg/L (CRC Handbook, 25 °C, from memory) = 47.337 kg.
    // Substrate 11.52 kg dry + 10.8 L × 0.4 porosity (from memory) × 0.997044 = 4.307 kg of pore water = 15.827 kg.
    // Total 12.42 + 47.337 + 15.827 + 6.1 = 81.684 kg, over 0.18 m² = 453.8 kg/m².
    const w = filledTankWeight({ shape: tank60, glassThicknessMm: 6, waterLitres: 47.47692, substrateLitres: 10.8, substrateKg: 11.52, hardscapeKg: 6.1 })
    expectWithin(w.waterKg, 47.3366, 1e-3)
    expectWithin(w.substrateKg, 15.8272, 1e-3)
    expectWithin(w.totalKg, 81.684, 1e-2)
    expectWithin(w.loadKgPerM2, 453.8, 0.1)
  })
})

describe('heater size and placement (common practice: 1 W/L up to 5 K over the room)', () => {
  it('suggests the next heater size up', () => {
    // 47.48 L, 26 °C in a 20 °C room: lift 6 K → 47.48 × 6/5 = 56.97 W → a 75 W heater.
    const cold = suggestHeaterWatts(47.477, 26, 20)
    expectWithin(cold.ruleWatts, 56.97, 0.01)
    expect(cold.watts).toBe(75)
    expect(cold.rule).toMatch(/common practice/)
    // In a 22 °C room: lift 4 K → 1 W/L = 47.48 W → 50 W. A room as warm as the tank keeps the 1 W/L floor.
    expect(suggestHeaterWatts(47.477, 26, 22).watts).toBe(50)
    expect(suggestHeaterWatts(47.477, 26, 28).watts).toBe(50)
    // 600 L, lift 5 K → 600 W, past the largest size: 50 W steps.
    expect(suggestHeaterWatts(600, 26, 21).watts).toBe(600)
  })

  it('keeps the heater under the level of a 50 % water change', () => {
    // Filled to 34 cm over 6 cm of substrate: 50.4 L; half out = 25.2 L at 1.8 L/cm = 14 cm → level 20 cm.
    expectWithin(heaterTopMaxCm(tank60, 34, 6), 20, 1e-9)
  })
})

describe('conditioner dose from the label rate', () => {
  it('scales 5 mL per 10 L to the 47.48 L filled', () => {
    // 47.477 / 10 × 5 = 23.74 mL; the label stays the authority.
    const dose = conditionerDose(47.47692, { amount: 5, unit: 'mL', per: '10L' })
    expectWithin(dose.amount, 23.7385, 1e-4)
    expect(dose.unit).toBe('mL')
    expect(() => conditionerDose(47, { amount: 0, unit: 'mL', per: 'L' })).toThrow(/labelRate.amount/)
  })
})
