import { describe, expect, it } from 'vitest'
import { DEMO_FAULT_PERIOD_REAL_S, demoScenarios, parseScenarioList, parseScenarioPlan, scenarioElapsedS } from '../../../simulator/model/scenarios'
import { parseOptions } from '../../../simulator/options'

describe('scenario lists', () => {
  it('parses names with spaces and dashes, and optional timing', () => {
    const plans = parseScenarioList('Sales row A1=heater_stuck_on, Display 2 — planted scape=large_water_change@60/1800')
    expect(plans.get('Sales row A1')).toEqual({ scenario: 'heater_stuck_on', startAfterS: 0, repeatEveryS: null })
    expect(plans.get('Display 2 — planted scape')).toEqual({ scenario: 'large_water_change', startAfterS: 60, repeatEveryS: 1800 })
  })

  it('gives water changes, quiet sensors and pH crashes a default start', () => {
    expect(parseScenarioPlan('large_water_change')).toEqual({ scenario: 'large_water_change', startAfterS: 120, repeatEveryS: 3600 })
    expect(parseScenarioPlan('sensor_quiet')).toEqual({ scenario: 'sensor_quiet', startAfterS: 300, repeatEveryS: null })
    expect(parseScenarioPlan('ph_crash@30')).toEqual({ scenario: 'ph_crash', startAfterS: 30, repeatEveryS: null })
  })

  it('rejects unknown scenarios and entries without a tank name', () => {
    expect(() => parseScenarioList('A1=boiling')).toThrow(/unknown scenario 'boiling'/)
    expect(() => parseScenarioList('heater_stuck_on')).toThrow(/Tank name=scenario/)
    expect(() => parseScenarioList('=ph_crash')).toThrow(/Tank name=scenario/)
    expect(() => parseScenarioPlan('large_water_change@0/0')).toThrow(/above zero/)
  })

  it('reads an active time that bounds each occurrence', () => {
    expect(parseScenarioPlan('heater_stuck_on@60/3600+600')).toEqual({ scenario: 'heater_stuck_on', startAfterS: 60, repeatEveryS: 3600, activeForS: 600 })
    expect(() => parseScenarioPlan('heater_stuck_on@60/3600+3600')).toThrow(/shorter than the repeat period/)
    const plan = parseScenarioPlan('sensor_quiet@100/1000+200')
    expect(scenarioElapsedS(plan, 150)).toBe(50)
    expect(scenarioElapsedS(plan, 300)).toBeNull()
    expect(scenarioElapsedS(plan, 1150)).toBe(50)
  })

  it('places the demo faults in real time, whatever the speed', () => {
    for (const speed of [1, 20]) {
      const plans = demoScenarios(speed)
      expect([...plans.keys()].sort()).toEqual(['Breeding cylinder C1', 'Display 2 — planted scape', 'Quarantine Q1', 'Sales row A1'])
      expect(plans.get('Quarantine Q1')).toEqual({
        scenario: 'heater_stuck_on',
        startAfterS: 300 * speed,
        repeatEveryS: 3600 * speed,
        activeForS: 2100 * speed,
      })
      expect(plans.get('Display 2 — planted scape')?.scenario).toBe('large_water_change')
      expect(plans.get('Breeding cylinder C1')?.scenario).toBe('sensor_quiet')
      expect(plans.get('Sales row A1')?.scenario).toBe('ph_crash')
    }
  })

  it('plays each demo fault at most once an hour of real time, each over by itself before its next', () => {
    const speed = 20
    for (const [tank, plan] of demoScenarios(speed)) {
      expect(plan.repeatEveryS, tank).toBe(DEMO_FAULT_PERIOD_REAL_S * speed)
      // Starts of an occurrence over three real hours, sampled every real second.
      const starts: number[] = []
      let wasActive = false
      for (let realS = 0; realS < 3 * 3600; realS++) {
        const elapsed = scenarioElapsedS(plan, realS * speed, plan.scenario === 'large_water_change' ? 35 * 60 : undefined)
        if (elapsed !== null && !wasActive) starts.push(realS)
        wasActive = elapsed !== null
      }
      expect(starts.length, tank).toBe(3)
      starts.slice(1).forEach((s, i) => expect(s - starts[i]!, tank).toBe(3600))
      // Bounded: over well within the hour (a crash then recovers over three simulated hours).
      expect(plan.activeForS ?? 35 * 60, tank).toBeLessThan(40 * 60 * speed)
    }
  })

  it('opens nothing but a quiet sensor and a stuck heater in a newcomer’s first half hour', () => {
    // Which faults have begun by 30 real minutes (the stuck heater's alarm waits for the water to warm).
    const begun = [...demoScenarios(20)].filter(([, plan]) => plan.startAfterS < 30 * 60 * 20).map(([tank, plan]) => `${tank}: ${plan.scenario}`)
    expect(begun.sort()).toEqual(['Breeding cylinder C1: sensor_quiet', 'Quarantine Q1: heater_stuck_on'])
  })

  it('times occurrences from the start, repeating when asked', () => {
    const once = { scenario: 'ph_crash' as const, startAfterS: 600, repeatEveryS: null }
    expect(scenarioElapsedS(once, 599)).toBeNull()
    expect(scenarioElapsedS(once, 700)).toBe(100)
    expect(scenarioElapsedS(once, 100_000)).toBe(99_400)
    const hourly = { scenario: 'large_water_change' as const, startAfterS: 120, repeatEveryS: 3600 }
    expect(scenarioElapsedS(hourly, 120 + 3600 + 60, 2100)).toBe(60)
    expect(scenarioElapsedS(hourly, 120 + 3000, 2100)).toBeNull()
    expect(scenarioElapsedS({ scenario: 'none', startAfterS: 0, repeatEveryS: null }, 50)).toBeNull()
  })
})

describe('command-line options', () => {
  it('has working defaults', () => {
    const options = parseOptions([])
    expect(options).toMatchObject({
      url: 'http://127.0.0.1:8080',
      email: 'owner@marrowfen.example',
      password: 'tankwarden-demo',
      transport: 'mqtt',
      mqttUrl: 'mqtt://127.0.0.1:1883',
      tanks: null,
      intervalS: 10,
      speed: 1,
      durationS: null,
      once: false,
      seed: 1,
    })
  })

  it('reads flags, environment fallbacks, and merges --scenario over --demo-scenarios', () => {
    const options = parseOptions(
      [
        '--transport',
        'http',
        '--tanks',
        '3',
        '--interval',
        '2',
        '--speed',
        '60',
        '--demo-scenarios',
        '--scenario',
        'Display 2 — planted scape=malformed',
        '--once',
      ],
      { SIMULATOR_EMAIL: 'boss@example.test', MQTT_URL: 'mqtt://broker:1884' },
    )
    if (options === 'help') throw new Error('unexpected help')
    expect(options.transport).toBe('http')
    expect(options.tanks).toBe(3)
    expect(options.intervalS).toBe(2)
    expect(options.speed).toBe(60)
    expect(options.once).toBe(true)
    expect(options.email).toBe('boss@example.test')
    expect(options.mqttUrl).toBe('mqtt://broker:1884')
    expect(options.scenarios.get('Display 2 — planted scape')?.scenario).toBe('malformed')
    // The demo faults at 60× start as many simulated seconds later as real ones.
    expect(options.scenarios.get('Quarantine Q1')).toMatchObject({ scenario: 'heater_stuck_on', startAfterS: 300 * 60 })
  })

  it('refuses bad values', () => {
    expect(() => parseOptions(['--transport', 'carrier-pigeon'])).toThrow(/mqtt or http/)
    expect(() => parseOptions(['--speed', '0'])).toThrow(/positive/)
    expect(() => parseOptions(['--tanks', '2.5'])).toThrow(/whole/)
    expect(() => parseOptions(['--frobnicate'])).toThrow()
    expect(parseOptions(['--help'])).toBe('help')
  })
})
