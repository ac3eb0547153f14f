import { describe, expect, it } from 'vitest'
import { KINDS, RULE_KINDS, kindEntry, type ConditionWords } from '@shared/rules/kinds'
import { watchRuleSpecSchema, type WatchRuleSpec } from '@shared/rules/schema'
import { replay } from '@shared/rules/evaluate'
import { CAUSE_TITLES } from '@shared/rules/cause'

// Every kind the schema accepts must have its entry: the engine rebuilds a rule's state from the
// entry's look-back, the rule form shows the entry's fields, and the words come from it.
const schemaKinds = watchRuleSpecSchema.options.map((option) => option.shape.kind.value as string)
const COMMON = new Set(['kind', 'metric', 'settleMinutes', 'missingReading'])
const plainWords: ConditionWords = {
  metric: (m) => m,
  value: (m, v) => `${v} ${m}`,
  change: (m, d) => `${d} ${m}`,
  minutes: (n) => `${n} min`,
}

/** A spec of `kind` as an untouched rule form would send it, with numbers in the empty boxes. */
function formSpec(kind: string): WatchRuleSpec {
  const entry = kindEntry(kind)
  const raw: Record<string, unknown> = { kind }
  if (!entry.fixedMetric) raw.metric = 'temperature'
  // Empty boxes get 10, 20, …: increasing, so a band's `max` lies above its `min`.
  entry.fields.forEach((field, index) => (raw[field.key] = field.initial === '' ? 10 * (index + 1) : Number(field.initial)))
  return watchRuleSpecSchema.parse(raw)
}

/** The spec's durations: every `…Minutes` field but the settle window, which is about after a clear. */
const durationsOf = (spec: WatchRuleSpec) =>
  Object.entries(spec)
    .filter(([key, value]) => key.endsWith('Minutes') && key !== 'settleMinutes' && typeof value === 'number')
    .map(([, value]) => value as number)

describe('the kinds table', () => {
  it('lists the schema’s kinds, no more and no fewer', () => {
    expect(schemaKinds.length).toBeGreaterThan(0)
    expect([...RULE_KINDS]).toEqual(schemaKinds)
    expect(Object.keys(KINDS).sort()).toEqual([...schemaKinds].sort())
  })

  it('throws on a kind it does not know, instead of reading it as zero', () => {
    expect(() => kindEntry('sideways')).toThrow('watch-rule kind "sideways" has no entry in shared/rules/kinds.ts')
  })

  describe.each(schemaKinds)('%s', (kind) => {
    const entry = kindEntry(kind)

    it('has a label and a form field for every field of its spec', () => {
      expect(entry.label.trim()).not.toBe('')
      const shape = watchRuleSpecSchema.options.find((o) => o.shape.kind.value === kind)!.shape
      const specFields = Object.keys(shape)
        .filter((key) => !COMMON.has(key))
        .sort()
      expect(entry.fields.map((f) => f.key).sort()).toEqual(specFields)
      expect(!entry.fixedMetric).toBe('metric' in shape)
    })

    it('looks back over its longest duration, never zero when it has one', () => {
      const spec = formSpec(kind)
      const durations = durationsOf(spec)
      expect(durations.length).toBeGreaterThan(0)
      const longest = Math.max(...durations)
      expect(longest).toBeGreaterThan(0)
      expect(entry.lookbackMinutes(spec)).toBe(longest)
    })

    it('evaluates, describes and measures a spec of its kind', () => {
      const spec = formSpec(kind)
      const result = replay(spec, [{ at: 0, value: 1 }], 60_000, { heaterTopCm: 10, isScheduledOn: () => true })
      expect(['clear', 'holding', 'tripped']).toContain(result.state.status)
      const words = entry.describe(spec, plainWords)
      expect(words).not.toMatch(/undefined|NaN/)
      expect(words.length).toBeGreaterThan(10)
      const measured = entry.measure(
        spec,
        'temperature',
        12.5,
        { metric: (m) => m, measured: (m, v) => `${v} ${m}`, limit: (m, v) => `${v} ${m}`, number: String, minutes: (n) => `${n} min` },
        10,
      )
      expect(measured).not.toMatch(/undefined|NaN/)
      expect(measured).toMatch(/12\.5|2\.5/)
    })

    it('names a site-wide cause and the mail’s advice', () => {
      const spec = formSpec(kind)
      const cause = entry.cause(spec, entry.fixedMetric ?? 'temperature', 12.5)
      // A probe's own fault (it disagrees with the kit, it stands still) says nothing about the site.
      if (kind === 'probe_kit' || kind === 'stuck') expect(cause).toBeUndefined()
      else expect(Object.keys(CAUSE_TITLES)).toContain(cause)
      expect(entry.advice.firstStep(spec, 'temperature', 12.5)).toMatch(/^First: \S/)
      const checks = entry.advice.checks(spec, 'temperature')
      expect(checks.length).toBeGreaterThan(0)
      for (const check of checks) expect(check).not.toMatch(/undefined|NaN/)
    })
  })
})
