import { describe as group, expect, it } from 'vitest'
import { MAX_WINDOW_POINTS } from '@shared/rules/rate'
import { T0, at, run, spec } from './clock'
import type { Step } from './clock'

// Pure logic over invented readings. Values are chosen to be exact in binary floating point
// (quarters and halves) wherever a comparison sits right on the limit.
type Case = [title: string, steps: Step[], expected: string[]]

group('rate', () => {
  const temperatureRate = spec({ kind: 'rate', metric: 'temperature', maxChange: 2, windowMinutes: 60 })
  const phRate = spec({ kind: 'rate', metric: 'ph', maxChange: 0.3, windowMinutes: 24 * 60 })

  const temperatureCases: Case[] = [
    [
      'a change of exactly maxChange does not trip',
      [
        ['r', 0, 25],
        ['r', 30, 26],
        ['r', 60, 27],
      ],
      [],
    ],
    [
      'trips when the change exceeds maxChange; updates; clears as the window slides',
      [
        ['r', 0, 25],
        ['r', 30, 26],
        ['r', 45, 27.25],
        ['r', 50, 27.5],
        ['r', 90, 27.5],
      ],
      ['trip@45 2.25 since@45', 'update@50 2.5 peak 2.5', 'clear@90 1.5'],
    ],
    [
      'a falling temperature trips with a negative change',
      [
        ['r', 0, 26],
        ['r', 20, 23.75],
      ],
      ['trip@20 -2.25 since@20'],
    ],
    [
      'ticks neither trip nor clear',
      [
        ['r', 0, 25],
        ['r', 10, 27.5],
        ['t', 30],
        ['t', 300],
      ],
      ['trip@10 2.5 since@10'],
    ],
    [
      'readings older than the window drop out',
      [
        ['r', 0, 25],
        ['r', 61, 27.5],
      ],
      [],
    ],
    [
      'a lone reading after a gap clears with no measured change',
      [
        ['r', 0, 25],
        ['r', 10, 27.5],
        ['r', 200, 27.5],
      ],
      ['trip@10 2.5 since@10', 'clear@200'],
    ],
    [
      'a late reading inside the window counts from the next reading on',
      [
        ['r', 30, 25],
        ['r', 50, 26],
        ['r', 10, 23.5],
        ['r', 55, 26],
      ],
      ['trip@55 2.5 since@55'],
    ],
    [
      'a late reading older than the window is dropped',
      [
        ['r', 30, 25],
        ['r', 50, 26],
        ['r', -20, 23.5],
        ['r', 55, 26],
      ],
      [],
    ],
  ]
  it.each(temperatureCases)('temperature 2 °C in 60 min: %s', (_title, steps, expected) => {
    expect(run(temperatureRate, steps).events).toEqual(expected)
  })

  it('pH 0.3 in 24 h: counts a reading exactly 24 h old, then lets it go', () => {
    const steps: Step[] = [
      ['r', 0, 7.0],
      ['r', 600, 6.9],
      ['r', 1200, 6.75],
      ['r', 1440, 6.69],
      ['r', 1500, 6.68],
    ]
    expect(run(phRate, steps).events).toEqual(['trip@1440 -0.31 since@1440', 'clear@1500 -0.22'])
  })

  it('a late reading changes the window but not the status', () => {
    const result = run(temperatureRate, [
      ['r', 30, 25],
      ['r', 50, 26],
      ['r', 10, 23.5],
    ])
    expect(result.state.status).toBe('clear')
    expect(result.state.window).toEqual([
      [at(10), 23.5],
      [at(30), 25],
      [at(50), 26],
    ])
    expect(result.state.lastReadingAt).toBe(at(50))
  })

  it('keeps the window bounded: one point per slot, the oldest exact, the newest reading as the state', () => {
    const steps: Step[] = Array.from({ length: 1000 }, (_, i): Step => ['r', i, 7 + (i % 2) * 0.01])
    const { state } = run(phRate, steps)
    const window = state.window ?? []
    expect(window.length).toBeLessThanOrEqual(MAX_WINDOW_POINTS)
    // 1,000 minutes in slots of 24 h / 238 (about 6 min): about 166 slots, each holding its first reading.
    expect(window.length).toBeGreaterThan(160)
    expect(window[0]).toEqual([T0, 7])
    expect([state.lastReadingAt, state.lastValue]).toEqual([at(999), 7.01])
  })

  it('measures a slow day-long fall across the bounded window, and clears as the fall leaves it', () => {
    // A reading a minute for two days, falling 0.4 over the first day, then level.
    const steps: Step[] = Array.from({ length: 2 * 1440 }, (_, i): Step => ['r', i, 7.5 - (0.4 * Math.min(i, 1440)) / 1440])
    const { events } = run(phRate, steps)
    // 0.3 of the fall is reached at minute 1080; the trip may not wait for a slot (6 min) to pass.
    expect(events[0]).toMatch(/^trip@108[01] -0\.30/)
    // Level after minute 1440: exactly, the change drops to 0.3 once the window starts after minute
    // 360; measured from a slot's first reading, up to one slot (about 6 min) sooner.
    const clear = Number(/^clear@(\d+)/.exec(events.find((e) => e.startsWith('clear'))!)![1])
    expect(clear).toBeGreaterThanOrEqual(1800 - 7)
    expect(clear).toBeLessThanOrEqual(1800)
  })

  it("copies no window for a reading in a slot already held, and a late reading keeps its slot's oldest", () => {
    // Slots of a 24 h window are 24 h / 238 long, counted from the epoch; b is the first slot start after T0.
    const slot = (24 * 60) / (MAX_WINDOW_POINTS - 2)
    const b = (Math.ceil(T0 / (slot * 60_000)) * slot * 60_000 - T0) / 60_000
    const once = run(phRate, [
      ['r', b, 7],
      ['r', b + 2, 7],
    ])
    const again = run(phRate, [['r', b + 3, 7]], {}, once.state)
    expect(again.state.window).toBe(once.state.window)
    expect(again.state.window).toEqual([[at(b), 7]])
    const late = run(
      phRate,
      [
        ['r', b + slot + 3, 6.9],
        ['r', b + slot + 2, 6.8],
        ['r', b + 1, 6.7],
      ],
      {},
      again.state,
    )
    expect(late.state.window).toEqual([
      [at(b), 7],
      [at(b + slot + 2), 6.8],
    ])
  })
})

group('quiet', () => {
  const quiet = spec({ kind: 'quiet', metric: 'temperature', quietMinutes: 15 })
  const cases: Case[] = [
    [
      'trips on the tick 15 min after the last reading, not before',
      [
        ['r', 0, 25],
        ['t', 14],
        ['t', 14.99],
        ['t', 15],
      ],
      ['trip@15 15 since@0'],
    ],
    [
      'a late tick reports the whole silence',
      [
        ['r', 0, 25],
        ['t', 22.5],
      ],
      ['trip@22.5 22.5 since@0'],
    ],
    [
      'no second trip on later ticks; the next reading clears',
      [
        ['r', 0, 25],
        ['t', 15],
        ['t', 20],
        ['t', 60],
        ['r', 61, 25.1],
      ],
      ['trip@15 15 since@0', 'clear@61 25.1'],
    ],
    [
      'silence is counted again from the reading that cleared it',
      [
        ['r', 0, 25],
        ['t', 15],
        ['r', 21, 25.1],
        ['t', 35],
        ['t', 36],
      ],
      ['trip@15 15 since@0', 'clear@21 25.1', 'trip@36 15 since@21'],
    ],
    [
      'readings alone never trip it',
      [
        ['r', 0, 25],
        ['r', 60, 25],
      ],
      [],
    ],
    [
      'regular readings keep it clear',
      [
        ['r', 0, 25],
        ['t', 10],
        ['r', 12, 25],
        ['t', 20],
        ['r', 25, 25],
        ['t', 39],
      ],
      [],
    ],
    [
      'a sensor that never reports trips 15 min after watching began',
      [
        ['t', 0],
        ['t', 14],
        ['t', 15],
      ],
      ['trip@15 15 since@0'],
    ],
    [
      'a late reading does not end the silence',
      [
        ['r', 0, 25],
        ['t', 15],
        ['r', -5, 24],
      ],
      ['trip@15 15 since@0'],
    ],
  ]
  it.each(cases)('%s', (_title, steps, expected) => {
    expect(run(quiet, steps).events).toEqual(expected)
  })
})

group('light_schedule', () => {
  // Lights on 08:00–20:00 UTC; T0 is 07:00 UTC, so the schedule turns on at minute 60.
  const isScheduledOn = (ms: number) => {
    const hour = new Date(ms).getUTCHours()
    return hour >= 8 && hour < 20
  }
  const light = spec({ kind: 'light_schedule', holdMinutes: 15 })
  const cases: Case[] = [
    [
      'lights that stay off when due on trip 15 min after the schedule turned on',
      [
        ['r', 0, 5],
        ['t', 30],
        ['t', 61],
        ['t', 74],
        ['t', 75],
        ['r', 80, 400],
      ],
      ['trip@75 5 since@60', 'clear@80 400'],
    ],
    [
      'the hold starts at the schedule change even if the first tick is late',
      [
        ['r', 0, 5],
        ['t', 70],
        ['t', 74.9],
        ['t', 75],
      ],
      ['trip@75 5 since@60'],
    ],
    [
      'lights on outside the schedule trip',
      [
        ['r', 0, 300],
        ['t', 14],
        ['t', 15],
      ],
      ['trip@15 300 since@0'],
    ],
    [
      'exactly onLux counts as on',
      [
        ['r', 0, 50],
        ['t', 15],
      ],
      ['trip@15 50 since@0'],
    ],
    [
      'a reading that agrees resets the hold',
      [
        ['r', 0, 300],
        ['r', 10, 2],
        ['t', 15],
        ['t', 30],
      ],
      [],
    ],
    [
      'an agreeing schedule change clears while tripped',
      [
        ['r', 40, 300],
        ['t', 55],
        ['t', 60],
      ],
      ['trip@55 300 since@40', 'clear@60 300'],
    ],
    [
      'peak is the reading farthest from the threshold',
      [
        ['r', 61, 10],
        ['t', 76],
        ['r', 77, 0],
        ['r', 78, 20],
      ],
      ['trip@76 10 since@61', 'update@77 0 peak 0', 'update@78 20 peak 0'],
    ],
  ]
  it.each(cases)('%s', (_title, steps, expected) => {
    expect(run(light, steps, { isScheduledOn }).events).toEqual(expected)
  })

  it('uses a custom onLux', () => {
    const dim = spec({ kind: 'light_schedule', holdMinutes: 0, onLux: 200 })
    expect(
      run(
        dim,
        [
          ['r', 61, 150],
          ['r', 62, 250],
        ],
        { isScheduledOn },
      ).events,
    ).toEqual(['trip@61 150 since@61', 'clear@62 250'])
  })

  it('stays inert without a schedule in the context', () => {
    expect(
      run(
        light,
        [
          ['r', 0, 300],
          ['t', 60],
        ],
        {},
      ).events,
    ).toEqual([])
  })
})
