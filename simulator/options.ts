// Command-line flags (node:util parseArgs), with environment fallbacks for the sign-in.
import { parseArgs } from 'node:util'
import { demoScenarios, parseScenarioList, type ScenarioPlan } from './model/scenarios'

export interface SimulatorOptions {
  url: string
  email: string
  password: string
  transport: 'mqtt' | 'http'
  mqttUrl: string
  tanks: number | null
  intervalS: number
  speed: number
  scenarios: Map<string, ScenarioPlan>
  durationS: number | null
  once: boolean
  seed: number
}

export const USAGE = `Usage: tsx simulator/index.ts [options]
  --url URL              app base URL (default http://127.0.0.1:8080, env TANKWARDEN_URL)
  --email E --password P owner sign-in (env SIMULATOR_EMAIL / SIMULATOR_PASSWORD)
  --transport mqtt|http  how nodes send readings (default mqtt)
  --mqtt-url URL         broker (default mqtt://127.0.0.1:1883, env MQTT_URL)
  --tanks N              simulate only the first N non-empty tanks
  --interval S           real seconds between sends (default 10)
  --speed X              simulated time runs X times real time (default 1)
  --scenario 'Tank=scenario[@startS[/everyS]][+activeS],…'
  --demo-scenarios       the demo shop's built-in faults, once an hour of real time each (merged under --scenario)
  --duration S           stop after S real seconds
  --once                 send one batch per tank and exit
  --seed N               random seed (default 1)
  --help`

function positive(name: string, text: string | undefined, fallback: number): number {
  if (text === undefined) return fallback
  const value = Number(text)
  if (!Number.isFinite(value) || value <= 0) throw new Error(`--${name} must be a positive number (got '${text}')`)
  return value
}

export function parseOptions(argv: string[], env: Record<string, string | undefined> = {}): SimulatorOptions | 'help' {
  const { values } = parseArgs({
    args: argv,
    strict: true,
    options: {
      url: { type: 'string' },
      email: { type: 'string' },
      password: { type: 'string' },
      transport: { type: 'string' },
      'mqtt-url': { type: 'string' },
      tanks: { type: 'string' },
      interval: { type: 'string' },
      speed: { type: 'string' },
      scenario: { type: 'string' },
      'demo-scenarios': { type: 'boolean' },
      duration: { type: 'string' },
      once: { type: 'boolean' },
      seed: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
  })
  if (values.help) return 'help'
  const transport = values.transport ?? 'mqtt'
  if (transport !== 'mqtt' && transport !== 'http') throw new Error(`--transport must be mqtt or http (got '${transport}')`)
  const tanks = values.tanks === undefined ? null : positive('tanks', values.tanks, 0)
  if (tanks !== null && !Number.isInteger(tanks)) throw new Error('--tanks must be a whole number')
  const seed = Number(values.seed ?? 1)
  if (!Number.isInteger(seed)) throw new Error('--seed must be a whole number')
  const speed = positive('speed', values.speed, 1)
  const scenarios = new Map(values['demo-scenarios'] ? demoScenarios(speed) : [])
  for (const [name, plan] of parseScenarioList(values.scenario ?? '')) scenarios.set(name, plan)
  return {
    url: values.url ?? env.TANKWARDEN_URL ?? 'http://127.0.0.1:8080',
    email: values.email ?? env.SIMULATOR_EMAIL ?? 'owner@marrowfen.example',
    password: values.password ?? env.SIMULATOR_PASSWORD ?? 'tankwarden-demo',
    transport,
    mqttUrl: values['mqtt-url'] ?? env.MQTT_URL ?? 'mqtt://127.0.0.1:1883',
    tanks,
    intervalS: positive('interval', values.interval, 10),
    speed,
    scenarios,
    durationS: values.duration === undefined ? null : positive('duration', values.duration, 0),
    once: values.once ?? false,
    seed,
  }
}
