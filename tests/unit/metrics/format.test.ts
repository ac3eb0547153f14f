import { describe, expect, it } from 'vitest'
import { formatValue } from '@shared/metrics'

describe('formatValue', () => {
  it('rounds to the metric precision in the canonical unit by default', () => {
    expect(formatValue('temperature', 25.04)).toBe('25.0')
    expect(formatValue('ph', 7.126)).toBe('7.13')
    expect(formatValue('conductivity', 612.4)).toBe('612')
  })

  it('converts to the display unit first', () => {
    // NIST SP 811 (2008), §B.8: 25 °C × 1.8 + 32 = 77 °F.
    expect(formatValue('temperature', 25, 'F')).toBe('77.0')
    expect(formatValue('conductivity', 1234.4, 'mS/cm')).toBe('1.234')
    expect(formatValue('water_level', 45.5, 'mm')).toBe('455')
    expect(formatValue('light', 5_000, 'pct', { fullScaleLux: 20_000 })).toBe('25')
  })

  it('never shows a negative zero', () => {
    expect(formatValue('ph', -0.001)).toBe('0.00')
  })

  it('throws for a unit it cannot show', () => {
    expect(() => formatValue('temperature', 20, 'K')).toThrow(/'K'/)
    expect(() => formatValue('light', 500, 'pct')).toThrow(/fullScaleLux/)
  })
})
