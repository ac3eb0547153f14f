import { describe, expect, it } from 'vitest'
import { formatBand, formatPercent, formatSpan, formatValue } from '@shared/report/format'

const temp = { metric: 'temperature' as const, unitLabel: '°C' }
const ph = { metric: 'ph' as const, unitLabel: 'pH' }

describe('report figures as text', () => {
  it('spans, percentages and values', () => {
    expect([formatSpan(0), formatSpan(600_000), formatSpan(4_200_000), formatSpan(43_200_000), formatSpan(183_600_000), formatSpan(null)]).toEqual([
      '0 min',
      '10 min',
      '1 h 10 min',
      '12 h 00 min',
      '2 d 3 h',
      '–',
    ])
    expect([formatPercent(98.71794), formatPercent(null)]).toEqual(['98.7 %', '–'])
    expect([formatValue(temp, 26.04), formatValue(ph, 7.2), formatValue(ph, null)]).toEqual(['26.0 °C', 'pH 7.20', '–'])
  })

  it('bands closed, open on one side, or missing', () => {
    expect(formatBand({ ...temp, band: { min: 24, max: 28 } })).toBe('24.0–28.0 °C')
    expect(formatBand({ ...ph, band: { min: 6.8, max: 7.6 } })).toBe('pH 6.80–7.60')
    expect(formatBand({ ...temp, band: { min: 24, max: null } })).toBe('≥ 24.0 °C')
    expect(formatBand({ ...ph, band: { min: null, max: 8 } })).toBe('≤ pH 8.00')
    expect(formatBand({ ...temp, band: null })).toBe('no target band')
  })
})
