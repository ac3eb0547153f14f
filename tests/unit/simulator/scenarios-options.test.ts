import { describe, expect, it } from 'vitest'
import { DEMO_SCENARIOS, parseScenarioList, parseScenarioPlan, scenarioElapsedS } from '../../../simulator/model/scenarios'
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

  it('holds the demo mapping', () => {
    expect(DEMO_SCENARIOS.get('Sales row A1')?.scenario).toBe('heater_stuck_on')
    expect(DEMO_SCENARIOS.get('Display 2 — planted scape')).toEqual({ scenario: 'large_water_change', startAfterS: 120, repeatEveryS: 3600 })
    expect(DEMO_SCENARIOS.get('Breeding cylinder C1')).toEqual({ scenario: 'sensor_quiet', startAfterS: 300, repeatEveryS: null })
    expect(DEMO_SCENARIOS.get('Quarantine Q1')?.scenario).toBe('ph_crash')
    expect(DEMO_SCENARIOS.size).toBe(4)
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
      ['--transport', 'http', '--tanks', '3', '--interval', '2', '--speed', '60', '--demo-scenarios', '--scenario', 'Sales row A1=malformed', '--once'],
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
    expect(options.scenarios.get('Sales row A1')?.scenario).toBe('malformed')
    expect(options.scenarios.get('Quarantine Q1')?.scenario).toBe('ph_crash')
  })

  it('refuses bad values', () => {
    expect(() => parseOptions(['--transport', 'carrier-pigeon'])).toThrow(/mqtt or http/)
    expect(() => parseOptions(['--speed', '0'])).toThrow(/positive/)
    expect(() => parseOptions(['--tanks', '2.5'])).toThrow(/whole/)
    expect(() => parseOptions(['--frobnicate'])).toThrow()
    expect(parseOptions(['--help'])).toBe('help')
  })
})
