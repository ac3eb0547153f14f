import { evaluate, initialRuleState, watchRuleSpecSchema } from '@shared/rules'
import type { RuleContext, RuleEvent, RuleInput, RuleState, WatchRuleSpec, WatchRuleSpecInput } from '@shared/rules'

/** Monday 5 January 2026, 07:00 UTC: an arbitrary origin; tests speak in minutes from it. */
export const T0 = Date.UTC(2026, 0, 5, 7, 0)
export const MIN = 60_000
export const at = (minute: number): number => T0 + minute * MIN

/** `['r', minute, value]` is a reading, `['t', minute]` a tick. */
export type Step = ['r', number, number] | ['t', number]

export const toInput = (step: Step): RuleInput => (step[0] === 'r' ? { type: 'reading', at: at(step[1]), value: step[2] } : { type: 'tick', at: at(step[1]) })

const num = (value: number): string => String(Number(value.toFixed(4)))
const minute = (ms: number): string => num((ms - T0) / MIN)

/** Events written compactly with minutes from T0, e.g. `trip@10 28.5 since@0`. */
export function describeEvent(event: RuleEvent): string {
  switch (event.type) {
    case 'trip':
      return `trip@${minute(event.at)} ${num(event.value)} since@${minute(event.since)}`
    case 'update':
      return `update@${minute(event.at)} ${num(event.value)} peak ${num(event.peak)}`
    case 'clear':
      return event.value === undefined ? `clear@${minute(event.at)}` : `clear@${minute(event.at)} ${num(event.value)}`
  }
}

export const spec = (input: WatchRuleSpecInput): WatchRuleSpec => watchRuleSpecSchema.parse(input)

export interface Run {
  events: string[]
  state: RuleState
  states: RuleState[]
}

export function run(rule: WatchRuleSpec, steps: Step[], ctx: RuleContext = {}, start = initialRuleState()): Run {
  let state = start
  const events: string[] = []
  const states: RuleState[] = []
  for (const step of steps) {
    const result = evaluate(rule, state, toInput(step), ctx)
    state = result.state
    states.push(state)
    if (result.event) events.push(describeEvent(result.event))
  }
  return { events, state, states }
}

/** Ticks every `every` minutes from `from` to `to` inclusive, as an engine's timer would. */
export function ticks(from: number, to: number, every = 1): Step[] {
  const steps: Step[] = []
  for (let m = from; m <= to + 1e-9; m += every) steps.push(['t', m])
  return steps
}

/** Readings and ticks merged in time order; a reading goes before a tick at the same minute. */
export function timeline(readings: Array<['r', number, number]>, tickSteps: Step[]): Step[] {
  return [...readings, ...tickSteps].sort((a, b) => a[1] - b[1] || (a[0] === 'r' ? -1 : 1))
}
