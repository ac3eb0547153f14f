import { describe, expect, it } from 'vitest'
import { ATOMIC_WEIGHT, MOLAR_MASS, NH3_PER_NH4, PO4_PER_PO4_P, fromCanonical, toCanonical } from '@shared/metrics'
import { specificGravity } from '@shared/chemistry/seawater-density'

const value = (r: ReturnType<typeof toCanonical>) => {
  if (!r.ok) throw new Error(r.reason)
  return r.value
}

// Factors come from the IUPAC abridged standard atomic weights, CIAAW "Standard atomic weights of the
// elements 2021": Ca 40.078, Mg 24.305, P 30.973762, O 15.999, N 14.007, H 1.008.
describe('marine units from CIAAW 2021 atomic weights', () => {
  it('uses the CIAAW 2021 values', () => {
    expect(ATOMIC_WEIGHT).toMatchObject({ Ca: 40.078, Mg: 24.305, P: 30.973762, O: 15.999, N: 14.007, H: 1.008 })
  })

  it('calcium: 10 mmol/L is 400.78 mg/L', () => {
    expect(value(toCanonical('calcium', 10, 'mmol/L'))).toBeCloseTo(400.78, 6)
    expect(value(fromCanonical('calcium', 420, 'mmol/L'))).toBeCloseTo(420 / 40.078, 9)
  })

  it('magnesium: 55 mmol/L is 1336.775 mg/L', () => {
    expect(value(toCanonical('magnesium', 55, 'mmol/L'))).toBeCloseTo(1336.775, 6)
  })

  it('phosphate: PO4 = 94.969762 g/mol, so 0.1 mg/L PO4-P is 0.306614 mg/L PO4', () => {
    expect(MOLAR_MASS.PO4).toBeCloseTo(94.969762, 9)
    expect(PO4_PER_PO4_P).toBeCloseTo(94.969762 / 30.973762, 12)
    expect(value(toCanonical('phosphate', 0.1, 'mg/L PO4-P'))).toBeCloseTo(0.3066136, 6)
  })

  it('ammonium kits: 1 mg/L NH4+ is 0.94411 mg/L total ammonia as NH3 (17.031 / 18.039), never taken 1:1', () => {
    expect(NH3_PER_NH4).toBeCloseTo(17.031 / 18.039, 12)
    expect(value(toCanonical('ammonia', 1, 'mg/L NH4'))).toBeCloseTo(0.944121, 6)
    expect(value(toCanonical('ammonia', 1, 'mg/L NH4'))).not.toBe(1)
  })

  // 1 °dH = 10 mg/L CaO (DIN 38409-6 German degree); CaO = 56.077 g/mol; alkalinity is 2 meq per mmol.
  it('alkalinity: 1 meq/L is 2.8039 °dKH', () => {
    expect(value(toCanonical('kh', 1, 'meq/L'))).toBeCloseTo(56.077 / 20, 9)
    expect(value(fromCanonical('kh', 8, 'meq/L'))).toBeCloseTo(8 * (20 / 56.077), 9)
  })

  it('salinity in ppt is taken as practical salinity, as keepers write it', () => {
    expect(value(toCanonical('salinity', 35, 'ppt'))).toBe(35)
  })

  it('specific gravity read at the water temperature needs that temperature', () => {
    const missing = toCanonical('specific_gravity', 1.025, 'SG_t')
    expect(missing.ok).toBe(false)
    expect(!missing.ok && missing.reason).toMatch(/temperature/)
    // A 25 °C hydrometer in 25 °C water already reads 25/25.
    expect(value(toCanonical('specific_gravity', 1.0264, 'SG_t', { temperatureC: 25 }))).toBeCloseTo(1.0264, 9)
    const at28 = value(toCanonical('specific_gravity', 1.025, 'SG_t', { temperatureC: 28 }))
    expect(at28).toBeGreaterThan(1.0258)
    expect(value(fromCanonical('specific_gravity', at28, 'SG_t', { temperatureC: 28 }))).toBeCloseTo(1.025, 9)
    expect(specificGravity(35, 25)).toBeCloseTo(1.02637, 5)
  })
})
