import { describe as group, expect, it } from 'vitest'
import { evaluate } from '@shared/rules'
import { at, run, spec, toInput } from './clock'
import type { Step } from './clock'

// Pure logic over invented readings: no real-world values are checked in this file.
const above = spec({ kind: 'above', metric: 'temperature', limit: 28, holdMinutes: 10, clearMargin: 0.5 })
const below = spec({ kind: 'below', metric: 'temperature', limit: 24, holdMinutes: 10, clearMargin: 0.5 })
const outside = spec({ kind: 'outside', metric: 'ph', min: 6.5, max: 7.5, holdMinutes: 5, clearMargin: 0.1 })
const heaterWarning = spec({ kind: 'heater_line', marginCm: 2 })
const heaterAlarm = spec({ kind: 'heater_line', marginCm: 0 })
const heaterTank = { heaterTopCm: 30 }

type Case = [title: string, steps: Step[], expected: string[]]

group('above: hold, hysteresis, wobble, peak', () => {
  const cases: Case[] = [
    [
      'trips on the tick exactly at hold end, not before',
      [
        ['r', 0, 28.5],
        ['t', 9],
        ['t', 9.99],
        ['t', 10],
        ['t', 11],
      ],
      ['trip@10 28.5 since@0'],
    ],
    [
      'trips on a reading exactly at hold end',
      [
        ['r', 0, 28.5],
        ['r', 5, 28.6],
        ['r', 10, 28.7],
      ],
      ['trip@10 28.7 since@0'],
    ],
    [
      'a reading at the limit resets the hold',
      [
        ['r', 0, 28.5],
        ['r', 5, 28],
        ['r', 6, 28.5],
        ['t', 10],
        ['t', 15],
        ['t', 16],
      ],
      ['trip@16 28.5 since@6'],
    ],
    [
      'wobbling on the limit never completes a hold',
      [
        ['r', 0, 28.1],
        ['r', 4, 28],
        ['r', 5, 28.1],
        ['r', 9, 28],
        ['r', 10, 28.1],
        ['t', 19.9],
      ],
      [],
    ],
    [
      'a reading exactly at the limit does not start a hold',
      [
        ['r', 0, 28],
        ['t', 10],
        ['t', 20],
      ],
      [],
    ],
    [
      'inside the clear margin while tripped stays tripped',
      [
        ['r', 0, 29],
        ['t', 10],
        ['r', 11, 27.8],
        ['r', 12, 27.5],
        ['r', 13, 27.4],
      ],
      ['trip@10 29 since@0', 'update@11 27.8 peak 29', 'update@12 27.5 peak 29', 'clear@13 27.4'],
    ],
    [
      'peak is the highest value since the trip',
      [
        ['r', 0, 29],
        ['t', 10],
        ['r', 11, 30],
        ['r', 12, 29.5],
        ['r', 13, 27],
      ],
      ['trip@10 29 since@0', 'update@11 30 peak 30', 'update@12 29.5 peak 30', 'clear@13 27'],
    ],
    [
      'no second trip while tripped, however many ticks',
      [
        ['r', 0, 29],
        ['t', 10],
        ['t', 20],
        ['t', 30],
        ['r', 31, 29.2],
        ['t', 45],
      ],
      ['trip@10 29 since@0', 'update@31 29.2 peak 29.2'],
    ],
    [
      'trips again after clearing, with a fresh hold',
      [
        ['r', 0, 29],
        ['t', 10],
        ['r', 11, 27],
        ['r', 12, 29],
        ['t', 21],
        ['t', 22],
      ],
      ['trip@10 29 since@0', 'clear@11 27', 'trip@22 29 since@12'],
    ],
  ]
  it.each(cases)('%s', (_title, steps, expected) => {
    expect(run(above, steps).events).toEqual(expected)
  })

  it('holds with the start time before tripping', () => {
    const { states } = run(above, [
      ['r', 0, 28.5],
      ['t', 9],
    ])
    expect(states[1]).toMatchObject({ status: 'holding', since: at(0), lastValue: 28.5, lastReadingAt: at(0) })
  })

  it('trips at once when holdMinutes is 0', () => {
    const instant = spec({ kind: 'above', metric: 'temperature', limit: 28 })
    expect(
      run(instant, [
        ['r', 0, 27.9],
        ['r', 1, 28.2],
      ]).events,
    ).toEqual(['trip@1 28.2 since@1'])
  })
})

group('below and outside', () => {
  const belowCases: Case[] = [
    [
      'trips at hold end',
      [
        ['r', 0, 23.5],
        ['t', 9.5],
        ['t', 10],
      ],
      ['trip@10 23.5 since@0'],
    ],
    [
      'hysteresis: 24.3 keeps it open, 24.6 clears',
      [
        ['r', 0, 23.5],
        ['t', 10],
        ['r', 11, 24.3],
        ['r', 12, 24.5],
        ['r', 13, 24.6],
      ],
      ['trip@10 23.5 since@0', 'update@11 24.3 peak 23.5', 'update@12 24.5 peak 23.5', 'clear@13 24.6'],
    ],
    [
      'peak is the lowest value',
      [
        ['r', 0, 23.5],
        ['t', 10],
        ['r', 11, 22],
        ['r', 12, 23],
      ],
      ['trip@10 23.5 since@0', 'update@11 22 peak 22', 'update@12 23 peak 22'],
    ],
    [
      'a reading at the limit resets the hold',
      [
        ['r', 0, 23.9],
        ['r', 3, 24],
        ['t', 10],
      ],
      [],
    ],
  ]
  it.each(belowCases)('below: %s', (_title, steps, expected) => {
    expect(run(below, steps).events).toEqual(expected)
  })

  const outsideCases: Case[] = [
    [
      'jumping from above the band to below it keeps holding',
      [
        ['r', 0, 7.6],
        ['r', 3, 6.4],
        ['t', 4.9],
        ['t', 5],
      ],
      ['trip@5 6.4 since@0'],
    ],
    [
      'peak is the value farthest outside, either side',
      [
        ['r', 0, 6.4],
        ['t', 5],
        ['r', 6, 7.9],
        ['r', 7, 6.2],
      ],
      ['trip@5 6.4 since@0', 'update@6 7.9 peak 7.9', 'update@7 6.2 peak 7.9'],
    ],
    [
      'clears only inside the band by the margin',
      [
        ['r', 0, 7.6],
        ['t', 5],
        ['r', 6, 7.45],
        ['r', 7, 7.39],
      ],
      ['trip@5 7.6 since@0', 'update@6 7.45 peak 7.6', 'clear@7 7.39'],
    ],
    [
      'the band edges themselves are inside',
      [
        ['r', 0, 6.5],
        ['r', 1, 7.5],
        ['t', 10],
      ],
      [],
    ],
  ]
  it.each(outsideCases)('outside: %s', (_title, steps, expected) => {
    expect(run(outside, steps).events).toEqual(expected)
  })
})

group('heater_line', () => {
  const cases: Array<[string, typeof heaterWarning, Step[], string[]]> = [
    [
      'warning trips at heater top + 2 cm',
      heaterWarning,
      [
        ['r', 0, 33],
        ['r', 1, 32],
      ],
      ['trip@1 32 since@1'],
    ],
    [
      'peak is the lowest level; clears above line + 0.5 cm',
      heaterWarning,
      [
        ['r', 0, 32],
        ['r', 1, 31.5],
        ['r', 2, 32.5],
        ['r', 3, 32.6],
      ],
      ['trip@0 32 since@0', 'update@1 31.5 peak 31.5', 'update@2 32.5 peak 31.5', 'clear@3 32.6'],
    ],
    [
      'alarm trips with the level at the heater top',
      heaterAlarm,
      [
        ['r', 0, 30.1],
        ['r', 1, 30],
      ],
      ['trip@1 30 since@1'],
    ],
    [
      'alarm stays quiet just above the heater top',
      heaterAlarm,
      [
        ['r', 0, 30.1],
        ['r', 1, 30.05],
      ],
      [],
    ],
  ]
  it.each(cases)('%s', (_title, rule, steps, expected) => {
    expect(run(rule, steps, heaterTank).events).toEqual(expected)
  })

  it('honours a hold time when one is set', () => {
    const held = spec({ kind: 'heater_line', marginCm: 0, holdMinutes: 3 })
    expect(
      run(
        held,
        [
          ['r', 0, 29],
          ['t', 2],
          ['t', 3],
        ],
        heaterTank,
      ).events,
    ).toEqual(['trip@3 29 since@0'])
  })

  it('stays inert without a heater top in the context', () => {
    const result = run(
      heaterAlarm,
      [
        ['r', 0, 1],
        ['t', 60],
      ],
      {},
    )
    expect(result.events).toEqual([])
    expect(result.state).toEqual({ status: 'clear' })
  })
})

group('late readings', () => {
  it('a late reading does not reset a hold', () => {
    expect(
      run(above, [
        ['r', 0, 28.5],
        ['r', 5, 28.6],
        ['r', 3, 27],
        ['t', 10],
      ]).events,
    ).toEqual(['trip@10 28.6 since@0'])
  })

  it('a late reading does not clear a tripped rule', () => {
    expect(
      run(above, [
        ['r', 0, 29],
        ['t', 10],
        ['r', 11, 29],
        ['r', 8, 20],
        ['t', 12],
      ]).events,
    ).toEqual(['trip@10 29 since@0', 'update@11 29 peak 29'])
  })

  it('returns the very same state object for a late reading', () => {
    const { state } = run(above, [
      ['r', 0, 28.5],
      ['r', 5, 28.6],
    ])
    expect(evaluate(above, state, toInput(['r', 4, 35]))).toEqual({ state })
  })

  it('ignores a reading that is not a number', () => {
    const { state } = run(above, [['r', 0, 28.5]])
    expect(evaluate(above, state, toInput(['r', 1, Number.NaN])).state).toBe(state)
  })
})
