import { DOMWrapper, flushPromises } from '@vue/test-utils'
import { afterEach, describe, expect, it } from 'vitest'
import { defaultRulesForTank } from '@shared/rules/defaults'
import { RULE_KINDS, kindEntry } from '@shared/rules/kinds'
import type { WatchRuleSpec } from '@shared/rules/schema'
import RuleDialog from '@/components/rules/RuleDialog.vue'
import { emptyRuleDraft, parseRuleDraft, draftFromRule } from '@/components/rules/rule-draft'
import { describeRule, formatMinutes } from '@/components/rules/rule-words'
import { setTemperatureUnit } from '@/composables/useUnits'
import { mountView } from './mount'

const alarm = (spec: WatchRuleSpec) => describeRule({ severity: 'alarm', spec })
const warning = (spec: WatchRuleSpec) => describeRule({ severity: 'warning', spec })

afterEach(() => setTemperatureUnit('C'))

describe('describeRule: each kind in plain words', () => {
  it('above', () => {
    expect(alarm({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 })).toBe(
      'Alarm when temperature is above 28.0 °C for 10 min; clears below 27.5 °C',
    )
  })

  it('below, without a hold', () => {
    expect(alarm({ kind: 'below', metric: 'temperature', limit: 24, holdMinutes: 0, clearMargin: 0.5 })).toBe(
      'Alarm when temperature is below 24.0 °C; clears above 24.5 °C',
    )
  })

  it('outside, with pH written once', () => {
    expect(warning({ kind: 'outside', metric: 'ph', min: 6.5, max: 7.5, holdMinutes: 30, clearMargin: 0.1 })).toBe(
      'Warning when pH is outside 6.50 – 7.50 for 30 min; clears back inside 6.60 – 7.40',
    )
  })

  it('rate', () => {
    expect(warning({ kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 1440 })).toBe('Warning when pH changes by more than 0.30 within 24 h')
  })

  it('quiet', () => {
    expect(warning({ kind: 'quiet', metric: 'temperature', quietMinutes: 15 })).toBe('Warning when no temperature reading arrives for 15 min')
  })

  it('heater line, with and without a margin', () => {
    expect(warning({ kind: 'heater_line', marginCm: 2, holdMinutes: 0, clearMargin: 0.5 })).toBe(
      'Warning when the water level is within 2 cm of the heater top or lower; clears once it is more than 2.5 cm above the heater top',
    )
    expect(alarm({ kind: 'heater_line', marginCm: 0, holdMinutes: 5, clearMargin: 0.5 })).toBe(
      'Alarm when the water level is at or below the heater top for 5 min; clears once it is more than 0.5 cm above the heater top',
    )
  })

  it('light schedule', () => {
    expect(warning({ kind: 'light_schedule', holdMinutes: 20, onLux: 50 })).toBe(
      'Warning when the light is on when the schedule says off, or off when it says on, for 20 min (on means at least 50 lux)',
    )
  })

  it('follows the person’s temperature unit, converting a level and a change differently', () => {
    setTemperatureUnit('F')
    // t/°F = 1.8 · t/°C + 32: 28 °C is 82.4 °F, 27.5 °C is 81.5 °F, and a change of 1 °C is
    // 1.8 °F. NIST Special Publication 811 (Thompson and Taylor, 2008), temperature
    // conversion — from memory for the exact section.
    expect(alarm({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 })).toBe(
      'Alarm when temperature is above 82.4 °F for 10 min; clears below 81.5 °F',
    )
    expect(warning({ kind: 'rate', metric: 'temperature', maxChange: 1, windowMinutes: 60 })).toBe(
      'Warning when temperature changes by more than 1.8 °F within 1 h',
    )
  })

  it('reads every starter rule a new tank gets', () => {
    const starters = defaultRulesForTank({ kind: 'tropical_freshwater', targets: { temperature: { min: 24, max: 27 } }, heaterTopCm: 30 })
    expect(starters.map(describeRule)).toEqual([
      'Alarm when temperature is above 27.0 °C for 10 min; clears below 26.5 °C',
      'Alarm when temperature is below 24.0 °C for 10 min; clears above 24.5 °C',
      'Warning when the water level is within 2 cm of the heater top or lower; clears once it is more than 2.5 cm above the heater top',
      'Alarm when the water level is at or below the heater top; clears once it is more than 0.5 cm above the heater top',
      'Warning when no temperature reading arrives for 15 min',
      'Warning when pH changes by more than 0.30 within 24 h',
    ])
  })

  it('writes durations the way a rota would', () => {
    expect([5, 60, 90, 1440, 2880, 10080].map(formatMinutes)).toEqual(['5 min', '1 h', '1 h 30 min', '24 h', '2 days', '7 days'])
  })
})

describe('rule form validation', () => {
  const aboveDraft = () => ({ ...emptyRuleDraft(), name: 'Too warm', severity: 'alarm' as const, kind: 'above' as const, limit: '28' })

  it('turns a good draft into the input the server takes, with only the kind’s fields', () => {
    expect(parseRuleDraft(aboveDraft())).toEqual({
      ok: true,
      input: {
        name: 'Too warm',
        severity: 'alarm',
        enabled: true,
        spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 },
      },
    })
  })

  it('names the bad hold time', () => {
    expect(parseRuleDraft({ ...aboveDraft(), holdMinutes: '-5' })).toEqual({ ok: false, errors: { holdMinutes: 'must be at least 0' } })
    expect(parseRuleDraft({ ...aboveDraft(), holdMinutes: '20000' })).toEqual({ ok: false, errors: { holdMinutes: 'at most 10080 minutes (7 days)' } })
    expect(parseRuleDraft({ ...aboveDraft(), holdMinutes: 'ten' })).toEqual({ ok: false, errors: { holdMinutes: 'enter a number' } })
  })

  it('asks for the limit and the name', () => {
    const result = parseRuleDraft({ ...aboveDraft(), name: ' ', limit: '' })
    expect(result).toEqual({ ok: false, errors: { name: 'required', limit: 'required' } })
  })

  it('refuses a band too narrow for its clear margin', () => {
    const draft = { ...aboveDraft(), kind: 'outside' as const, metric: 'ph' as const, min: '7', max: '7.1', clearMargin: '0.1' }
    expect(parseRuleDraft(draft)).toEqual({ ok: false, errors: { max: 'max must exceed min by more than twice the clear margin' } })
  })

  it('round-trips a stored rule through the form', () => {
    const spec: WatchRuleSpec = { kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 1440 }
    const result = parseRuleDraft(draftFromRule({ name: 'pH drift', severity: 'warning', enabled: false, spec }))
    expect(result).toEqual({ ok: true, input: { name: 'pH drift', severity: 'warning', enabled: false, spec } })
  })

  it('shows the message under the hold field and sends nothing', async () => {
    const { wrapper } = await mountView(RuleDialog, { props: { modelValue: true, title: 'New watch rule' } })
    await flushPromises()
    const inDocument = (selector: string) => new DOMWrapper(document.querySelector(selector)!)
    await inDocument('input[name="ruleName"]').setValue('Too warm')
    await inDocument('input[name="limit"]').setValue('28')
    await inDocument('input[name="holdMinutes"]').setValue('-5')
    expect(document.querySelector('[data-test="rule-preview"]')).toBeNull()
    await inDocument('.v-dialog form').trigger('submit')
    await flushPromises()
    expect(document.querySelector('.v-dialog')!.textContent).toContain('must be at least 0')
    expect(wrapper.findComponent(RuleDialog).emitted('save')).toBeUndefined()

    await inDocument('input[name="holdMinutes"]').setValue('10')
    expect(document.querySelector('[data-test="rule-preview"]')!.textContent).toContain(
      'Warning when temperature is above 28.0 °C for 10 min; clears below 27.5 °C',
    )
    await inDocument('.v-dialog form').trigger('submit')
    expect(wrapper.findComponent(RuleDialog).emitted('save')![0]).toEqual([
      { name: 'Too warm', severity: 'warning', enabled: true, spec: { kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 } },
    ])
  })
})

describe('the rule dialog asks what the kind’s entry in shared/rules/kinds.ts says', () => {
  const SHARED_BOXES = ['ruleName', 'ruleKind', 'ruleSeverity', 'ruleMetric', 'settleMinutes', 'missingReading']

  it.each([...RULE_KINDS])('%s', async (kind) => {
    const entry = kindEntry(kind)
    const { wrapper } = await mountView(RuleDialog, { props: { modelValue: true, title: 'New watch rule', initial: { ...emptyRuleDraft(), kind } } })
    await flushPromises()
    const names = [...document.querySelectorAll<HTMLInputElement>('.v-dialog input[name]')].map((input) => input.name)
    // The condition's boxes on the first line, hold and clearing on the second, each in the entry's order.
    const expected = [...entry.fields.filter((f) => f.line === 1), ...entry.fields.filter((f) => f.line === 2)].map((f) => f.key)
    expect(names.filter((name) => !SHARED_BOXES.includes(name))).toEqual(expected)
    expect(names.includes('ruleMetric')).toBe(entry.fixedMetric === null)
    expect(document.querySelector('[data-test="missing-reading"]') !== null).toBe(entry.asksMissingReading)
    const labels = [...document.querySelectorAll('.v-dialog .v-field-label')].map((label) => label.textContent?.trim())
    for (const field of entry.fields) expect(labels).toContain(field.label)
    wrapper.unmount()
  })
})
