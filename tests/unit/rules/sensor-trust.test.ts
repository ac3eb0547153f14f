import { describe, expect, it } from 'vitest'
import { evaluate } from '@shared/rules/evaluate'
import { watchRuleSpecSchema } from '@shared/rules/schema'
import { spikeRelease, spikeStep, SPIKE_HOLD_MS, type SpikeState } from '@shared/rules/spike-filter'
import { initialRuleState, type RuleInput, type RuleState } from '@shared/rules/types'

const MIN = 60_000
// Tolerances, noise floors and spike sizes are `common practice` (shared/calibration/probe-trust.ts).
const kitSpec = watchRuleSpecSchema.parse({ kind: 'probe_kit', metric: 'ph', tolerance: 0.2 })
const stuckSpec = watchRuleSpecSchema.parse({ kind: 'stuck', metric: 'temperature', flatMinutes: 180, noiseFloor: 0.05 })

function run(spec: typeof kitSpec, inputs: RuleInput[], ctx = {}) {
  let state: RuleState = initialRuleState()
  const events = []
  for (const input of inputs) {
    const r = evaluate(spec, state, input, ctx)
    state = r.state
    if (r.event) events.push(r.event)
  }
  return { state, events }
}

describe('probe_kit', () => {
  it('compares a kit value with the nearest probe reading and clears when a later one agrees', () => {
    const { events } = run(kitSpec, [
      { type: 'reading', at: 0, value: 7.4, source: 'device' },
      { type: 'reading', at: 5 * MIN, value: 7.45, source: 'device' },
      { type: 'reading', at: 4 * MIN, value: 7.1, source: 'test_kit' },
      { type: 'reading', at: 10 * MIN, value: 7.42, source: 'device' },
      { type: 'reading', at: 9 * MIN, value: 7.35, source: 'test_kit' },
    ])
    expect(events.map((e) => e.type)).toEqual(['trip', 'clear'])
    expect(events[0]).toMatchObject({ at: 4 * MIN, detail: { kit: 7.1, probe: 7.45 } })
    expect(events[0].value).toBeCloseTo(0.35, 9)
  })
  it('says nothing without a probe reading near the kit time', () => {
    const { events } = run(kitSpec, [
      { type: 'reading', at: 0, value: 7.4, source: 'device' },
      { type: 'reading', at: 60 * MIN, value: 6.5, source: 'test_kit' },
    ])
    expect(events).toEqual([])
  })
})

describe('stuck', () => {
  it('trips only for a probe seen moving, after the flat period; clears when it moves', () => {
    const still = Array.from({ length: 40 }, (_, i): RuleInput => ({ type: 'reading', at: i * 5 * MIN, value: 25.02 }))
    expect(run(stuckSpec as never, still).events).toEqual([])
    const moved: RuleInput[] = [{ type: 'reading', at: -10 * MIN, value: 24.8 }, ...still, { type: 'reading', at: 200 * MIN, value: 25.2 }]
    const { events } = run(stuckSpec as never, moved)
    expect(events.filter((e) => e.type !== 'update').map((e) => [e.type, e.at])).toEqual([
      ['trip', 180 * MIN],
      ['clear', 200 * MIN],
    ])
  })
})

describe('spike filter', () => {
  const feed = (values: Array<[number, number]>) => {
    let state: SpikeState = {}
    const passed: number[] = []
    for (const [at, value] of values) {
      const r = spikeStep('temperature', state, { at, value })
      state = r.state
      passed.push(...r.pass.map((p) => p.value))
    }
    return { state, passed }
  }
  it('drops a single far reading once the next comes back', () => {
    expect(
      feed([
        [0, 26],
        [1, 26.1],
        [2, 34],
        [3, 26.1],
      ]).passed,
    ).toEqual([26, 26.1, 26.1])
  })
  it('passes a step on with its first reading', () => {
    expect(
      feed([
        [0, 26],
        [1, 31],
        [2, 31.2],
      ]).passed,
    ).toEqual([26, 31, 31.2])
  })
  it('lets a held reading go when no successor comes', () => {
    const { state } = feed([
      [0, 26],
      [MIN, 31],
    ])
    expect(spikeRelease(state, MIN + SPIKE_HOLD_MS - 1).pass).toEqual([])
    expect(spikeRelease(state, MIN + SPIKE_HOLD_MS).pass).toEqual([{ at: MIN, value: 31 }])
  })
  it('leaves metrics without a spike size alone', () => {
    expect(spikeStep('nitrate', {}, { at: 0, value: 5 }).pass).toHaveLength(1)
  })
})
