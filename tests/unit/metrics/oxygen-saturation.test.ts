import { describe, expect, it } from 'vitest'
import { oxygenSolubilityMgL } from '@shared/chemistry/oxygen'
import { formatValue, fromCanonical, toCanonical } from '@shared/metrics'

// Percent saturation is defined against the solubility model in shared/chemistry/oxygen, whose
// own tests check it against published tables; here only the consistency with it is checked.
describe('oxygen in % saturation', () => {
  it('100 % at 25 °C is the solubility at 25 °C', () => {
    const result = toCanonical('oxygen', 100, 'pct_sat', { temperatureC: 25 })
    expect(result).toEqual({ ok: true, value: oxygenSolubilityMgL(25) })
  })

  it('80 % at 10 °C and 95 kPa is 0.8 × the solubility there', () => {
    const ctx = { temperatureC: 10, pressureKPa: 95 }
    const result = toCanonical('oxygen', 80, 'pct_sat', ctx)
    expect(result.ok && result.value).toBeCloseTo(0.8 * oxygenSolubilityMgL(10, 95), 10)
  })

  it('converts mg/L back to % saturation', () => {
    const saturated = oxygenSolubilityMgL(28)
    const result = fromCanonical('oxygen', saturated / 2, 'pct_sat', { temperatureC: 28 })
    expect(result.ok && result.value).toBeCloseTo(50, 10)
    expect(formatValue('oxygen', saturated, 'pct_sat', { temperatureC: 28 })).toBe('100')
  })

  it('rejects temperatures and pressures the solubility model does not cover', () => {
    expect(toCanonical('oxygen', 90, 'pct_sat', { temperatureC: 80 }).ok).toBe(false)
    expect(toCanonical('oxygen', 90, 'pct_sat', { temperatureC: 25, pressureKPa: 0 }).ok).toBe(false)
    expect(toCanonical('oxygen', 90, 'pct_sat', { temperatureC: 25, pressureKPa: 10 }).ok).toBe(false)
  })
})
