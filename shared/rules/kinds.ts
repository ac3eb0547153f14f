// Every watch-rule kind in one table: how it evaluates, how much history it needs, what it is
// called, how it reads in words, and what the rule form asks for. The engine, the rule dialog and
// the words all read it; a kind in the schema's union without an entry here does not compile.
import type { MetricKey } from '../metrics/registry'
import { heaterLineAdvice, levelAdvice, lightScheduleAdvice, probeKitAdvice, quietAdvice, rateAdvice, stuckAdvice, type KindAdvice } from './advice'
import { causeOfMetric, type CauseKey } from './cause'
import { evaluateLevelSpec } from './level'
import { evaluateQuiet } from './quiet'
import { evaluateRate } from './rate'
import { evaluateProbeKit } from './probe-kit'
import { evaluateStuck } from './stuck'
import { watchRuleSpecSchema, type SpecOfKind, type WatchRuleKind, type WatchRuleSpec } from './schema'
import type { EvaluationResult, RuleContext, RuleInput, RuleState } from './types'

/** Fields every kind shares; the form shows them for any kind. */
type CommonField = 'kind' | 'metric' | 'settleMinutes' | 'missingReading'
/** The spec fields of a kind the form asks for (all kinds' fields for the wide entry). */
export type FieldOf<K extends WatchRuleKind> = K extends WatchRuleKind ? Exclude<keyof SpecOfKind<K>, CommonField> & string : never
export type RuleFormField = FieldOf<WatchRuleKind>

/** One box of the rule form: a number of the spec, entered as text. */
export interface FormField<Key extends string = RuleFormField> {
  key: Key
  label: string
  /** `metric`: the watched metric's stored unit; otherwise shown as written. */
  suffix: 'metric' | 'min' | 'cm' | 'lux' | '%'
  /** What an empty form holds. */
  initial: string
  hint?: string
  /** 1: the condition itself; 2: how long it must hold and how far back it clears. */
  line: 1 | 2
}

/** What the words need from whoever shows them (the reader's units live on the client). */
export interface ConditionWords {
  /** "temperature"; "pH" keeps its capitals. */
  metric(metric: MetricKey): string
  /** A level with its unit, in the reader's unit: "28.0 °C". */
  value(metric: MetricKey, canonical: number): string
  /** A change with its unit: 1 °C of change is 1.8 °F. */
  change(metric: MetricKey, canonicalDelta: number): string
  /** "10 min", "24 h". */
  minutes(minutes: number): string
}

/** What incident words need: values at the metric's display precision (see shared/rules/measurement.ts). */
export interface MeasureWords {
  /** "temperature"; "pH" keeps its capitals. */
  metric(metric: string): string
  /** A measured value as measured, with its unit: "23.0 °C". */
  measured(metric: string, value: number): string
  /** A limit without trailing zeros, with its unit: "22 °C". */
  limit(metric: string, value: number): string
  /** A limit's number alone: "10". */
  number(metric: string, value: number): string
  /** "15 min", "2 h". */
  minutes(minutes: number): string
}

// Methods rather than function properties: an entry of one kind then serves where any kind's is asked for.
export interface KindEntry<K extends WatchRuleKind = WatchRuleKind> {
  /** The form's choice: "Above a limit". */
  label: string
  /** The metric a kind watches whatever the spec says, or null when the rule names its own. */
  fixedMetric: MetricKey | null
  /** The form's boxes for this kind, in order. */
  fields: ReadonlyArray<FormField<FieldOf<K>>>
  /** The evaluator for one input (finite, in order unless `takesLateReadings`, missing readings handled). */
  step(spec: SpecOfKind<K>, state: RuleState, input: RuleInput, ctx: RuleContext): EvaluationResult
  /** How far back, in minutes, stored readings rebuild the rule's state after a restart. */
  lookbackMinutes(spec: SpecOfKind<K>): number
  /** A reading older than the last one still counts (it is slotted into a window). */
  takesLateReadings: boolean
  /** Whether the rule's "if readings stop" choice applies; not for a kind that is itself about silence. */
  asksMissingReading: boolean
  /** When the timer's ticks can change the state: replaying history skips the others. */
  ticksMatter: 'always' | 'unless-clear' | 'never'
  /** The condition in plain words, without the severity. */
  describe(spec: SpecOfKind<K>, words: ConditionWords): string
  /**
   * What an incident measured, for mail, tile and timeline: "temperature 23.5 °C, above 10–22 °C".
   * `value` is the compared quantity (see RuleEvent), finite; `heaterTopCm` the tank's heater top.
   */
  measure(spec: SpecOfKind<K>, metric: string, value: number, words: MeasureWords, heaterTopCm?: number): string
  /**
   * What a trip points to when several tanks of a site trip at once (shared/rules/cause.ts); `value`
   * as for `measure`. Undefined: the trip is the probe's own fault and says nothing about the site.
   */
  cause(spec: SpecOfKind<K>, metric: MetricKey, value: number): CauseKey | undefined
  /** What the alert mail tells a keeper to do first and check (shared/rules/advice.ts). */
  advice: KindAdvice<K>
}

const HOLD: FormField<'holdMinutes'> = {
  key: 'holdMinutes',
  label: 'For at least',
  suffix: 'min',
  initial: '10',
  hint: 'Rides out a lid lifted or a door left open',
  line: 2,
}
const clearMargin = (suffix: FormField['suffix']): FormField<'clearMargin'> => ({
  key: 'clearMargin',
  label: 'Clears only this far back',
  suffix,
  initial: '0.5',
  hint: 'Stops one reading on the line reopening it',
  line: 2,
})

const level = {
  fixedMetric: null,
  step: evaluateLevelSpec,
  lookbackMinutes: (spec: { holdMinutes: number }) => spec.holdMinutes,
  takesLateReadings: false,
  asksMissingReading: true,
  ticksMatter: 'unless-clear',
  advice: levelAdvice,
} as const

const forHold = (minutes: number, words: ConditionWords) => (minutes > 0 ? ` for ${words.minutes(minutes)}` : '')
const cm = (value: number) => `${Number(value.toFixed(1))} cm`

export const KINDS = {
  above: {
    ...level,
    label: 'Above a limit',
    fields: [{ key: 'limit', label: 'Upper limit', suffix: 'metric', initial: '', line: 1 }, HOLD, clearMargin('metric')],
    describe: (s, w) =>
      `${w.metric(s.metric)} is above ${w.value(s.metric, s.limit)}${forHold(s.holdMinutes, w)}; clears below ${w.value(s.metric, s.limit - s.clearMargin)}`,
    measure: (s, metric, value, w) => `${w.metric(metric)} ${w.measured(metric, value)}, above ${w.limit(metric, s.limit)}`,
    cause: (_s, metric) => causeOfMetric(metric, true),
  },
  below: {
    ...level,
    label: 'Below a limit',
    fields: [{ key: 'limit', label: 'Lower limit', suffix: 'metric', initial: '', line: 1 }, HOLD, clearMargin('metric')],
    describe: (s, w) =>
      `${w.metric(s.metric)} is below ${w.value(s.metric, s.limit)}${forHold(s.holdMinutes, w)}; clears above ${w.value(s.metric, s.limit + s.clearMargin)}`,
    measure: (s, metric, value, w) => `${w.metric(metric)} ${w.measured(metric, value)}, below ${w.limit(metric, s.limit)}`,
    cause: (_s, metric) => causeOfMetric(metric, false),
  },
  outside: {
    ...level,
    label: 'Outside a band',
    fields: [
      { key: 'min', label: 'From', suffix: 'metric', initial: '', line: 1 },
      { key: 'max', label: 'To', suffix: 'metric', initial: '', line: 1 },
      HOLD,
      clearMargin('metric'),
    ],
    describe: (s, w) => {
      const band = `${w.value(s.metric, s.min)} – ${w.value(s.metric, s.max)}`
      const inner = `${w.value(s.metric, s.min + s.clearMargin)} – ${w.value(s.metric, s.max - s.clearMargin)}`
      return `${w.metric(s.metric)} is outside ${band}${forHold(s.holdMinutes, w)}; clears back inside ${inner}`
    },
    measure: (s, metric, value, w) => {
      const band = `${w.number(metric, s.min)}–${w.limit(metric, s.max)}`
      const side = value > s.max ? 'above' : value < s.min ? 'below' : 'back inside'
      return `${w.metric(metric)} ${w.measured(metric, value)}, ${side} ${metric === 'ph' ? `pH ${band}` : band}`
    },
    cause: (s, metric, value) => causeOfMetric(metric, value > s.max),
  },
  rate: {
    label: 'Changes too fast',
    fixedMetric: null,
    fields: [
      { key: 'maxChange', label: 'Largest change allowed', suffix: 'metric', initial: '', line: 1 },
      { key: 'windowMinutes', label: 'Within', suffix: 'min', initial: '60', line: 1 },
    ],
    step: (spec, state, input) => evaluateRate(spec, state, input),
    lookbackMinutes: (spec) => spec.windowMinutes,
    takesLateReadings: true,
    asksMissingReading: true,
    // A rate rule judges readings only.
    ticksMatter: 'never',
    describe: (s, w) => `${w.metric(s.metric)} changes by more than ${w.change(s.metric, s.maxChange)} within ${w.minutes(s.windowMinutes)}`,
    measure: (s, metric, value, w) =>
      `${w.metric(metric)} ${value < 0 ? 'fell' : 'rose'} ${w.measured(metric, Math.abs(value))} in ${w.minutes(s.windowMinutes)}`,
    // The compared quantity is the change, signed.
    cause: (_s, metric, value) => causeOfMetric(metric, value > 0),
    advice: rateAdvice,
  },
  quiet: {
    label: 'No readings',
    fixedMetric: null,
    fields: [{ key: 'quietMinutes', label: 'Silent for', suffix: 'min', initial: '15', line: 1 }],
    step: (spec, state, input) => evaluateQuiet(spec, state, input),
    lookbackMinutes: (spec) => spec.quietMinutes,
    takesLateReadings: false,
    asksMissingReading: false,
    ticksMatter: 'always',
    describe: (s, w) => `no ${w.metric(s.metric)} reading arrives for ${w.minutes(s.quietMinutes)}`,
    // The compared quantity is the minutes of silence.
    measure: (_s, metric, value, w) => `no ${w.metric(metric)} reading for ${w.minutes(value)}`,
    // Devices falling silent together point to the power, whatever they measure.
    cause: () => 'power',
    advice: quietAdvice,
  },
  heater_line: {
    ...level,
    label: 'Water near the heater top',
    fixedMetric: 'water_level',
    fields: [{ key: 'marginCm', label: 'Water at most this far above the heater top', suffix: 'cm', initial: '2', line: 1 }, HOLD, clearMargin('cm')],
    describe: (s, w) => {
      const where = s.marginCm > 0 ? `is within ${cm(s.marginCm)} of the heater top or lower` : 'is at or below the heater top'
      return `the water level ${where}${forHold(s.holdMinutes, w)}; clears once it is more than ${cm(s.marginCm + s.clearMargin)} above the heater top`
    },
    measure: (_s, _metric, value, w, heaterTopCm) => {
      const level = `water level ${w.measured('water_level', value)}`
      if (heaterTopCm === undefined) return level
      const top = `the heater top (${w.limit('water_level', heaterTopCm)})`
      const gap = value - heaterTopCm
      return gap <= 0 ? `${level}, at or below ${top}` : `${level}, ${w.limit('water_level', gap)} above ${top}`
    },
    cause: (_s, metric) => causeOfMetric(metric, false),
    advice: heaterLineAdvice,
  },
  light_schedule: {
    ...level,
    label: 'Light off its schedule',
    fixedMetric: 'light',
    fields: [{ key: 'onLux', label: 'Light counts as on from', suffix: 'lux', initial: '50', line: 1 }, HOLD],
    // The schedule moves under a standing reading.
    ticksMatter: 'always',
    describe: (s, w) =>
      `the light is on when the schedule says off, or off when it says on, for ${w.minutes(s.holdMinutes)} (on means at least ${Number(s.onLux.toFixed(1))} lux)`,
    measure: (_s, _metric, value, w) => `light ${w.measured('light', value)}, off its schedule`,
    cause: (_s, metric) => causeOfMetric(metric, false),
    advice: lightScheduleAdvice,
  },
  probe_kit: {
    label: 'Probe disagrees with the test kit',
    fixedMetric: null,
    fields: [
      { key: 'tolerance', label: 'Allowed difference', suffix: 'metric', initial: '0.2', line: 1 },
      { key: 'tolerancePercent', label: 'Or this share of the kit value', suffix: '%', initial: '0', hint: 'Whichever is larger', line: 1 },
      {
        key: 'withinMinutes',
        label: 'Probe reading within',
        suffix: 'min',
        initial: '15',
        hint: 'Of the test time, or the probe’s interval if longer',
        line: 2,
      },
    ],
    step: (spec, state, input, ctx) => evaluateProbeKit(spec, state, input, ctx),
    // A rebuild needs the probe readings near a kit value; running, the rule remembers a day of them for a kit value entered late.
    lookbackMinutes: (spec) => spec.withinMinutes,
    takesLateReadings: true,
    asksMissingReading: false,
    ticksMatter: 'never',
    describe: (s, w) => {
      const parts = [s.tolerance > 0 ? w.change(s.metric, s.tolerance) : '', s.tolerancePercent > 0 ? `${Number(s.tolerancePercent.toFixed(1))} %` : '']
      return `a test-kit ${w.metric(s.metric)} differs from the probe's reading by more than ${parts.filter(Boolean).join(' or ') || 'nothing'}; calibrate the probe`
    },
    // A difference is no level: the words convert levels (°C to °F adds 32), so a temperature difference stays in °C.
    measure: (_s, metric, value, w) =>
      metric === 'temperature'
        ? `temperature probe reads ${Number(Math.abs(value).toFixed(1))} °C ${value > 0 ? 'above' : 'below'} the test kit`
        : `${w.metric(metric)} probe reads ${w.measured(metric, Math.abs(value))} ${value > 0 ? 'above' : 'below'} the test kit`,

    // A probe's own fault says nothing about the site.
    cause: () => undefined,
    advice: probeKitAdvice,
  },
  stuck: {
    label: 'Probe stands still',
    fixedMetric: null,
    fields: [
      { key: 'flatMinutes', label: 'Unchanged for', suffix: 'min', initial: '180', line: 1 },
      { key: 'noiseFloor', label: 'Changes smaller than', suffix: 'metric', initial: '0.05', hint: 'The probe’s own noise', line: 1 },
    ],
    step: (spec, state, input) => evaluateStuck(spec, state, input),
    // The engine's look-back pad (two hours) lets a restarted engine see the probe move before the flat run.
    lookbackMinutes: (spec) => spec.flatMinutes,
    takesLateReadings: false,
    asksMissingReading: false,
    ticksMatter: 'never',
    describe: (s, w) =>
      `the ${w.metric(s.metric)} probe moves less than ${w.change(s.metric, s.noiseFloor)} for ${w.minutes(s.flatMinutes)}: frozen or out of the water?`,
    measure: (_s, metric, value, w) => `${w.metric(metric)} probe unchanged for ${w.minutes(value)}: frozen or out of the water?`,

    cause: () => undefined,
    advice: stuckAdvice,
  },
} satisfies { [K in WatchRuleKind]: KindEntry<K> }

/** Every kind the schema accepts, in its order. */
export const RULE_KINDS: readonly WatchRuleKind[] = watchRuleSpecSchema.options.map((option) => option.shape.kind.value)

/** A kind's entry; a kind without one is a programming error, never a silent default. */
export function kindEntry(kind: string): KindEntry {
  const entry: KindEntry | undefined = (KINDS as Record<string, KindEntry>)[kind]
  if (!entry) throw new Error(`watch-rule kind "${kind}" has no entry in shared/rules/kinds.ts`)
  return entry
}

/** The entry of a spec's kind. */
export const kindOf = (spec: WatchRuleSpec): KindEntry => kindEntry(spec.kind)

/** The metric a spec watches: its own, or its kind's fixed one. */
export function metricOfSpec(spec: WatchRuleSpec): MetricKey {
  return kindOf(spec).fixedMetric ?? (spec as { metric: MetricKey }).metric
}

/** What a trip of the spec points to; `value` is its compared quantity (see RuleEvent). */
export const causeOf = (spec: WatchRuleSpec, value: number): CauseKey | undefined => kindOf(spec).cause(spec, metricOfSpec(spec), value)

// Checked once on load: the schema and the table cannot drift apart unnoticed.
for (const kind of RULE_KINDS) kindEntry(kind)
