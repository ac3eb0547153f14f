import { describe, expect, it } from 'vitest'
import {
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  fromCanonical,
  METRIC_KEYS,
  METRICS,
  toCanonical,
  type ConversionContext,
  type ConversionResult,
  type MetricKey,
} from '@shared/metrics'

function valueOf(result: ConversionResult): number {
  if (!result.ok) throw new Error(`expected ok, got: ${result.reason}`)
  return result.value
}

function reasonOf(result: ConversionResult): string {
  if (result.ok) throw new Error(`expected a rejection, got ${result.value}`)
  return result.reason
}

describe('temperature', () => {
  // NIST SP 811 (Thompson & Taylor, 2008), §B.8: t/°C = (t/°F − 32)/1.8, so the fixed points
  // of water on the Fahrenheit scale are 32 °F and 212 °F.
  it.each([
    [32, 0],
    [212, 100],
    [-40, -40], // the two scales cross where t = 1.8 t + 32
  ])('%d °F = %d °C', (f, c) => {
    expect(valueOf(toCanonical('temperature', f, 'F'))).toBeCloseTo(c, 10)
    expect(valueOf(fromCanonical('temperature', c, 'F'))).toBeCloseTo(f, 10)
    expect(fahrenheitToCelsius(f)).toBeCloseTo(c, 10)
    expect(celsiusToFahrenheit(c)).toBeCloseTo(f, 10)
  })

  it('passes °C through', () => {
    expect(valueOf(toCanonical('temperature', 25.3, 'C'))).toBe(25.3)
  })
})

describe('water level', () => {
  // NIST SP 811 (2008), Appendix B.8: 1 in = 2.54 × 10⁻² m exactly.
  it('10 in = 25.4 cm', () => {
    expect(valueOf(toCanonical('water_level', 10, 'in'))).toBeCloseTo(25.4, 10)
    expect(valueOf(fromCanonical('water_level', 25.4, 'in'))).toBeCloseTo(10, 10)
  })

  // BIPM, The International System of Units, 9th ed. (2019), Table 7 (SI prefixes).
  it('455 mm = 45.5 cm', () => {
    expect(valueOf(toCanonical('water_level', 455, 'mm'))).toBeCloseTo(45.5, 10)
  })
})

describe('nitrogen compounds given "as N"', () => {
  // Expected values worked by hand from IUPAC 2021 abridged atomic weights (Prohaska et al.,
  // Pure Appl. Chem. 94, 2022): M(NH3) 17.031, M(NO2) 46.005, M(NO3) 62.004, M(N) 14.007.
  it('1 mg/L NH3-N = 1.2159 mg/L NH3', () => {
    expect(valueOf(toCanonical('ammonia', 1, 'mg/L NH3-N'))).toBeCloseTo(1.2159, 4)
  })

  it('0.5 mg/L NO2-N = 1.6422 mg/L NO2', () => {
    expect(valueOf(toCanonical('nitrite', 0.5, 'mg/L NO2-N'))).toBeCloseTo(1.6422, 4)
  })

  // Hach Support TE387 (2017): NO3 = NO3-N × 4.427.
  it('10 mg/L NO3-N = 44.27 mg/L NO3', () => {
    expect(valueOf(toCanonical('nitrate', 10, 'mg/L NO3-N'))).toBeCloseTo(44.27, 2)
    expect(valueOf(fromCanonical('nitrate', 44.27, 'mg/L NO3-N'))).toBeCloseTo(10, 2)
  })
})

describe('hardness', () => {
  // 1 °dH = 10 mg/L CaO = 17.848 mg/L CaCO3 = 0.17833 mmol/L, from IUPAC 2021 molar masses
  // (CaO 56.077, CaCO3 100.086); ChemLin "Deutscher Härtegrad" (2016) prints 17.8 and 0.1783.
  it.each(['kh', 'gh'] as const)('%s: 178.48 mg/L CaCO3 = 10 degrees', (metric) => {
    expect(valueOf(toCanonical(metric, 178.48, 'mg/L CaCO3'))).toBeCloseTo(10, 3)
  })

  it.each(['kh', 'gh'] as const)('%s: 1 mmol/L = 5.608 degrees', (metric) => {
    expect(valueOf(toCanonical(metric, 1, 'mmol/L'))).toBeCloseTo(5.608, 3)
  })

  it('1 mmol/L and 100.09 mg/L CaCO3 are the same hardness', () => {
    const fromMmol = valueOf(toCanonical('gh', 1, 'mmol/L'))
    const fromMg = valueOf(toCanonical('gh', 100.09, 'mg/L CaCO3'))
    expect(fromMg).toBeCloseTo(fromMmol, 3)
  })
})

describe('conductivity and light', () => {
  // BIPM SI Brochure, 9th ed. (2019), Table 7: milli = 10⁻³, micro = 10⁻⁶.
  it('1.413 mS/cm = 1413 µS/cm', () => {
    expect(valueOf(toCanonical('conductivity', 1.413, 'mS/cm'))).toBeCloseTo(1413, 9)
  })

  it('a percentage of full scale is that share of the full-scale lux', () => {
    const ctx = { fullScaleLux: 20_000 }
    expect(valueOf(toCanonical('light', 50, 'pct', ctx))).toBe(10_000)
    expect(valueOf(fromCanonical('light', 5_000, 'pct', ctx))).toBe(25)
  })
})

describe('round trips', () => {
  const ctx: ConversionContext = { temperatureC: 25, fullScaleLux: 30_000, pressureKPa: 101.325 }

  for (const metric of METRIC_KEYS) {
    for (const unit of Object.keys(METRICS[metric].units)) {
      it(`${metric} in ${unit}`, () => {
        const { min, max } = METRICS[metric].plausible
        for (const canonical of [min, min + (max - min) / 3, max]) {
          const shown = valueOf(fromCanonical(metric, canonical, unit, ctx))
          expect(valueOf(toCanonical(metric, shown, unit, ctx))).toBeCloseTo(canonical, 8)
        }
      })
    }
  }
})

describe('rejections', () => {
  it('names the unknown unit and the accepted ones', () => {
    const reason = reasonOf(toCanonical('temperature', 20, 'K'))
    expect(reason).toContain("'K'")
    expect(reason).toContain('C, F')
  })

  it.each([
    ['temperature', 'toString'],
    ['temperature', 'c'],
    ['ph', 'mg/L'],
    ['kh', 'dGH'],
    ['conductivity', 'µS/cm'],
  ] as const)('%s does not accept %j', (metric, unit) => {
    expect(toCanonical(metric, 1, unit).ok).toBe(false)
    expect(fromCanonical(metric, 1, unit).ok).toBe(false)
  })

  it('rejects a metric it does not know', () => {
    expect(toCanonical('chlorophyll' as MetricKey, 35, 'ug/L').ok).toBe(false)
  })

  it.each([Number.NaN, Number.POSITIVE_INFINITY])('rejects the value %d', (value) => {
    expect(toCanonical('ph', value, 'pH').ok).toBe(false)
  })

  it.each([{}, { fullScaleLux: 0 }, { fullScaleLux: -100 }, { fullScaleLux: Number.NaN }])('rejects light in pct with context %j', (ctx) => {
    expect(reasonOf(toCanonical('light', 50, 'pct', ctx))).toContain('fullScaleLux')
    expect(fromCanonical('light', 500, 'pct', ctx).ok).toBe(false)
  })

  it('rejects oxygen in pct_sat without a temperature', () => {
    expect(reasonOf(toCanonical('oxygen', 95, 'pct_sat'))).toContain('temperatureC')
    expect(fromCanonical('oxygen', 8, 'pct_sat', { fullScaleLux: 1 }).ok).toBe(false)
  })
})
