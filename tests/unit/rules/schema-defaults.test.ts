import { describe as group, expect, it } from 'vitest'
import { defaultRulesForTank, metricOfSpec, watchRuleDraftSchema, watchRuleSpecSchema } from '@shared/rules'

group('watchRuleSpecSchema', () => {
  it('fills the documented defaults', () => {
    expect(watchRuleSpecSchema.parse({ kind: 'heater_line', marginCm: 2 })).toEqual({
      kind: 'heater_line',
      marginCm: 2,
      holdMinutes: 0,
      clearMargin: 0.5,
    })
    expect(watchRuleSpecSchema.parse({ kind: 'light_schedule', holdMinutes: 20 })).toEqual({
      kind: 'light_schedule',
      holdMinutes: 20,
      onLux: 50,
    })
  })

  const rejected: Array<[string, unknown, string]> = [
    ['an unknown kind', { kind: 'sideways', metric: 'ph' }, 'kind'],
    ['an unknown metric', { kind: 'above', metric: 'turbidity', limit: 1 }, 'metric'],
    ['a negative hold', { kind: 'above', metric: 'ph', limit: 8, holdMinutes: -1 }, 'holdMinutes'],
    ['a band too narrow to ever clear', { kind: 'outside', metric: 'ph', min: 7, max: 7.25, clearMargin: 0.125 }, 'max'],
    ['an empty band', { kind: 'outside', metric: 'ph', min: 7, max: 7 }, 'max'],
    ['a zero rate limit', { kind: 'rate', metric: 'ph', maxChange: 0, windowMinutes: 60 }, 'maxChange'],
    ['a zero quiet period', { kind: 'quiet', metric: 'ph', quietMinutes: 0 }, 'quietMinutes'],
    ['a light rule without a hold', { kind: 'light_schedule' }, 'holdMinutes'],
  ]
  it.each(rejected)('rejects %s', (_title, input, field) => {
    const result = watchRuleSpecSchema.safeParse(input)
    expect(result.success).toBe(false)
    expect(result.error?.issues.map((issue) => issue.path.join('.'))).toContain(field)
  })

  it('names the metric each kind watches', () => {
    expect(metricOfSpec(watchRuleSpecSchema.parse({ kind: 'heater_line', marginCm: 0 }))).toBe('water_level')
    expect(metricOfSpec(watchRuleSpecSchema.parse({ kind: 'light_schedule', holdMinutes: 5 }))).toBe('light')
    expect(metricOfSpec(watchRuleSpecSchema.parse({ kind: 'quiet', metric: 'ph', quietMinutes: 5 }))).toBe('ph')
  })
})

group('defaultRulesForTank', () => {
  // Thresholds are the product's starter set (common practice), not published limits.
  const full = defaultRulesForTank({
    kind: 'freshwater',
    targets: { temperature: { min: 24, max: 28 }, ph: { min: 6.5, max: 7.5 } },
    heaterTopCm: 30,
  })

  it('names every rule in plain English, in a fixed order', () => {
    expect(full.map((rule) => `${rule.severity}: ${rule.name}`)).toEqual([
      'alarm: Temperature above 28 °C for 10 min',
      'alarm: Temperature below 24 °C for 10 min',
      'warning: Water level within 2 cm of the heater top',
      'alarm: Water level at or below the heater top',
      'warning: No temperature reading for 15 min',
      'warning: pH changed by more than 0.3 in 24 h',
    ])
  })

  it('builds the specs from the targets', () => {
    expect(full.map((rule) => rule.spec)).toEqual([
      { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
      { kind: 'below', metric: 'temperature', limit: 24, holdMinutes: 10, clearMargin: 0.5 },
      { kind: 'heater_line', marginCm: 2, holdMinutes: 0, clearMargin: 0.5 },
      { kind: 'heater_line', marginCm: 0, holdMinutes: 0, clearMargin: 0.5 },
      { kind: 'quiet', metric: 'temperature', quietMinutes: 15 },
      { kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 1440 },
    ])
  })

  it('produces drafts the API schema accepts unchanged', () => {
    for (const rule of full) expect(watchRuleDraftSchema.parse(rule)).toEqual(rule)
  })

  it('leaves out temperature limits and heater rules it has no numbers for', () => {
    const bare = defaultRulesForTank({ kind: 'marine', targets: {} })
    expect(bare.map((rule) => rule.spec.kind)).toEqual(['quiet', 'rate'])
  })

  it('writes fractional targets without trailing zeros', () => {
    const rules = defaultRulesForTank({ kind: 'freshwater', targets: { temperature: { min: 23.5, max: 26.25 } } })
    expect(rules.slice(0, 2).map((rule) => rule.name)).toEqual(['Temperature above 26.25 °C for 10 min', 'Temperature below 23.5 °C for 10 min'])
  })
})
