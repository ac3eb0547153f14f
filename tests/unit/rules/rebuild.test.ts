import { describe as group, expect, it } from 'vitest'
import { evaluate, rebuildState, replay } from '@shared/rules'
import type { RuleContext, RuleState, WatchRuleSpec } from '@shared/rules'
import { at, describeEvent, run, spec, ticks, timeline, toInput } from './clock'

// After a restart the engine has only the stored readings and the clock; no old ticks.
const isScheduledOn = (ms: number) => {
  const hour = new Date(ms).getUTCHours()
  return hour >= 8 && hour < 20
}

interface RestartCase {
  title: string
  rule: WatchRuleSpec
  ctx: RuleContext
  readings: Array<['r', number, number]>
  restartAt: number
  until: number
  expectedTrip: string
}

const restartCases: RestartCase[] = [
  {
    title: 'above, restart mid-hold',
    rule: spec({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 }),
    ctx: {},
    readings: [
      ['r', 0, 28.5],
      ['r', 4, 28.6],
      ['r', 8, 28.7],
    ],
    restartAt: 6,
    until: 20,
    expectedTrip: 'trip@10 28.7 since@0',
  },
  {
    title: 'below, restart mid-hold between readings',
    rule: spec({ kind: 'below', metric: 'temperature', limit: 24, holdMinutes: 10, clearMargin: 0.5 }),
    ctx: {},
    readings: [
      ['r', 0, 24.2],
      ['r', 3, 23.8],
      ['r', 6, 23.6],
    ],
    restartAt: 9.5,
    until: 20,
    expectedTrip: 'trip@13 23.6 since@3',
  },
  {
    title: 'outside, restart mid-hold',
    rule: spec({ kind: 'outside', metric: 'ph', min: 6.5, max: 7.5, holdMinutes: 5, clearMargin: 0.1 }),
    ctx: {},
    readings: [
      ['r', 0, 7.6],
      ['r', 2, 7.7],
    ],
    restartAt: 3,
    until: 10,
    expectedTrip: 'trip@5 7.7 since@0',
  },
  {
    title: 'heater_line with a hold, restart mid-hold',
    rule: spec({ kind: 'heater_line', marginCm: 2, holdMinutes: 5 }),
    ctx: { heaterTopCm: 30 },
    readings: [
      ['r', 0, 33],
      ['r', 1, 31.9],
    ],
    restartAt: 4,
    until: 10,
    expectedTrip: 'trip@6 31.9 since@1',
  },
  {
    title: 'light_schedule, restart after the schedule turned on',
    rule: spec({ kind: 'light_schedule', holdMinutes: 15 }),
    ctx: { isScheduledOn },
    readings: [['r', 0, 5]],
    restartAt: 66.5,
    until: 90,
    expectedTrip: 'trip@75 5 since@60',
  },
  {
    title: 'quiet, restart during the silence',
    rule: spec({ kind: 'quiet', metric: 'temperature', quietMinutes: 15 }),
    ctx: {},
    readings: [
      ['r', 0, 25],
      ['r', 5, 25],
    ],
    restartAt: 12,
    until: 30,
    expectedTrip: 'trip@20 15 since@5',
  },
  {
    title: 'rate, restart inside the window',
    rule: spec({ kind: 'rate', metric: 'temperature', maxChange: 2, windowMinutes: 60 }),
    ctx: {},
    readings: [
      ['r', 0, 25],
      ['r', 30, 26],
      ['r', 45, 27.25],
    ],
    restartAt: 40,
    until: 50,
    expectedTrip: 'trip@45 2.25 since@45',
  },
]

function trips(events: string[]): string[] {
  return events.filter((e) => e.startsWith('trip'))
}

group('restart mid-hold', () => {
  it.each(restartCases)('$title', ({ rule, ctx, readings, restartAt, until, expectedTrip }) => {
    const uninterrupted = run(rule, timeline(readings, ticks(0, until)), ctx)
    expect(trips(uninterrupted.events)).toEqual([expectedTrip])

    const stored = readings.filter(([, minute]) => minute <= restartAt)
    const rebuilt = rebuildState(
      rule,
      stored.map(([, minute, value]) => ({ at: at(minute), value })),
      at(restartAt),
      ctx,
    )
    const afterRestart = timeline(
      readings.filter(([, minute]) => minute > restartAt),
      ticks(Math.ceil(restartAt), until),
    )
    const resumed = run(rule, afterRestart, ctx, rebuilt)
    expect(trips(resumed.events)).toEqual([expectedTrip])
  })
})

group('restart while tripped', () => {
  const above = spec({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 })
  const readings = [0, 5, 10, 15, 20].map((minute) => ({ at: at(minute), value: 29 }))

  it('comes back tripped with its peak and opens nothing new', () => {
    const state = rebuildState(above, readings, at(22))
    expect(state).toMatchObject({ status: 'tripped', since: at(10), peakValue: 29, lastReadingAt: at(20) })
    const resumed = run(
      above,
      [
        ['t', 23],
        ['r', 25, 29.5],
        ['t', 40],
        ['r', 41, 27],
      ],
      {},
      state,
    )
    expect(resumed.events).toEqual(['update@25 29.5 peak 29.5', 'clear@41 27'])
  })

  it('sorts stored readings before replaying them', () => {
    const shuffled = [readings[3], readings[0], readings[4], readings[1], readings[2]] as typeof readings
    expect(rebuildState(above, shuffled, at(22))).toEqual(rebuildState(above, readings, at(22)))
  })

  it('replay lists the events a stored history produced, the final tick included', () => {
    const history = [
      { at: at(0), value: 28.5 },
      { at: at(2), value: 28.6 },
    ]
    expect(replay(above, history, at(12)).events.map(describeEvent)).toEqual(['trip@10 28.6 since@0'])
  })

  it('trips on the restart tick, dated when the hold ended during the downtime', () => {
    const state = rebuildState(above, [{ at: at(0), value: 28.5 }], at(30))
    expect(state).toMatchObject({ status: 'tripped', since: at(10) })
  })
})

group('purity', () => {
  it('never mutates the state it is given', () => {
    const rule = spec({ kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 1440 })
    const state: RuleState = { status: 'clear', lastValue: 7, lastReadingAt: at(0), window: [[at(0), 7]] }
    const frozen = JSON.stringify(state)
    evaluate(rule, state, toInput(['r', 10, 6.5]))
    evaluate(rule, state, toInput(['r', -10, 6.5]))
    expect(JSON.stringify(state)).toBe(frozen)
  })

  it('keeps state JSON-serialisable', () => {
    const rule = spec({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 })
    const { state } = run(rule, [
      ['r', 0, 29],
      ['t', 10],
      ['r', 11, 30],
    ])
    expect(JSON.parse(JSON.stringify(state))).toEqual(state)
  })
})
