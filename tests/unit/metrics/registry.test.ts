import { describe, expect, it } from 'vitest'
import { displayPrecision, isMetricKey, METRIC_KEYS, METRICS, supportedUnits } from '@shared/metrics'

describe('metric registry', () => {
  it('lists the seventeen metrics of the product, each defined once', () => {
    expect([...METRIC_KEYS].sort()).toEqual(
      [
        'ammonia',
        'conductivity',
        'gh',
        'kh',
        'light',
        'nitrate',
        'nitrite',
        'oxygen',
        'ph',
        'temperature',
        'water_level',
        'salinity',
        'specific_gravity',
        'calcium',
        'magnesium',
        'phosphate',
        'copper',
      ].sort(),
    )
    expect(Object.keys(METRICS).sort()).toEqual([...METRIC_KEYS].sort())
  })

  it.each(METRIC_KEYS)('%s is self-consistent', (key) => {
    const def = METRICS[key]
    expect(def.key).toBe(key)
    expect(def.label.length).toBeGreaterThan(0)
    expect(def.units[def.unit]?.label).toBe(def.unitLabel)
    expect(def.plausible.min).toBeLessThan(def.plausible.max)
    expect(Number.isInteger(def.precision)).toBe(true)
    expect(def.precision).toBeGreaterThanOrEqual(0)
    for (const unit of Object.values(def.units)) expect(unit.label.length).toBeGreaterThan(0)
  })

  it.each(METRIC_KEYS)('%s: every listed unit converts and nothing else does', (key) => {
    expect(supportedUnits(key).sort()).toEqual(Object.keys(METRICS[key].units).sort())
  })

  it('stores the canonical units of the product brief', () => {
    const canonical = Object.fromEntries(METRIC_KEYS.map((k) => [k, METRICS[k].unit]))
    expect(canonical).toEqual({
      temperature: 'C',
      ph: 'pH',
      light: 'lux',
      water_level: 'cm',
      ammonia: 'mg/L',
      nitrite: 'mg/L',
      nitrate: 'mg/L',
      kh: 'dKH',
      gh: 'dGH',
      conductivity: 'uS/cm',
      oxygen: 'mg/L',
      salinity: 'PSU',
      specific_gravity: 'SG25',
      calcium: 'mg/L',
      magnesium: 'mg/L',
      phosphate: 'mg/L',
      copper: 'mg/L',
    })
  })

  it('marks the test-kit metrics', () => {
    const kit = METRIC_KEYS.filter((k) => METRICS[k].kitMetric)
    expect(kit.sort()).toEqual(
      [
        'temperature',
        'ph',
        'ammonia',
        'nitrite',
        'nitrate',
        'kh',
        'gh',
        'conductivity',
        'oxygen',
        'salinity',
        'specific_gravity',
        'calcium',
        'magnesium',
        'phosphate',
        'copper',
      ].sort(),
    )
  })

  it('keeps plausibility bounds physically sensible', () => {
    expect(METRICS.temperature.plausible).toEqual({ min: -5, max: 60 })
    expect(METRICS.ph.plausible).toEqual({ min: 0, max: 14 })
    expect(METRICS.water_level.plausible).toEqual({ min: 0, max: 300 })
    expect(METRICS.ammonia.plausible).toEqual({ min: 0, max: 50 })
  })

  it('uses a unit-specific precision where the canonical one would hide the value', () => {
    expect(displayPrecision('conductivity')).toBe(0)
    expect(displayPrecision('conductivity', 'mS/cm')).toBe(3)
    expect(displayPrecision('kh', 'mmol/L')).toBe(2)
    expect(displayPrecision('temperature', 'F')).toBe(1)
  })
})

describe('isMetricKey', () => {
  it.each(METRIC_KEYS)('accepts %s', (key) => {
    expect(isMetricKey(key)).toBe(true)
  })

  it.each(['Temperature', 'pH', 'waterLevel', 'toString', '', 1, null, undefined, {}])('rejects %j', (x) => {
    expect(isMetricKey(x)).toBe(false)
  })
})
