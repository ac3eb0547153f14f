// Entry point: `npm run simulate` — a shop full of sensor nodes speaking the public device contract.
import { createApiClient, waitForApi } from './api-client'
import { FaultyOutbox } from './model/faults'
import { mulberry32, seedFrom } from './model/random'
import { NO_SCENARIO } from './model/scenarios'
import { TankSimulation } from './model/tank'
import { parseOptions, USAGE, type SimulatorOptions } from './options'
import { provisionDevices, type ProvisionedTank } from './provision'
import { runLoop, type SimulatedNode } from './runner'
import { createHttpTransport } from './transport/http'
import { createMqttTransport } from './transport/mqtt'
import type { Transport } from './transport/types'

const log = (line: string) => console.log(`[simulator] ${line}`)

async function transportFor(options: SimulatorOptions, tank: ProvisionedTank): Promise<Transport> {
  if (options.transport === 'http') {
    return createHttpTransport({ url: options.url, deviceId: tank.deviceId, token: tank.token })
  }
  return createMqttTransport({
    url: options.mqttUrl,
    deviceId: tank.deviceId,
    token: tank.token,
    onEvent: (event, detail) => {
      if (event !== 'connect') log(`${tank.spec.name}: mqtt ${event}${detail ? ` (${detail})` : ''}`)
    },
  })
}

async function buildNodes(options: SimulatorOptions, tanks: ProvisionedTank[]): Promise<SimulatedNode[]> {
  const startMs = Date.now()
  const built = await Promise.all(
    tanks.map(async (tank): Promise<SimulatedNode | null> => {
      const plan = options.scenarios.get(tank.spec.name) ?? NO_SCENARIO
      const seed = seedFrom(options.seed, tank.tankId)
      const outbox =
        plan.scenario === 'malformed' || plan.scenario === 'duplicates_and_out_of_order'
          ? new FaultyOutbox(plan.scenario, mulberry32(seedFrom(seed, 'outbox')))
          : null
      try {
        const transport = await transportFor(options, tank)
        const sim = new TankSimulation(tank.spec, { seed, startMs, plan })
        if (plan.scenario !== 'none') log(`${tank.spec.name}: scenario ${plan.scenario} from ${plan.startAfterS} s`)
        return { tankName: tank.spec.name, deviceId: tank.deviceId, sim, transport, outbox, retryQueue: [] }
      } catch (err) {
        log(`${tank.spec.name}: cannot connect device ${tank.deviceId}: ${(err as Error).message}`)
        return null
      }
    }),
  )
  return built.filter((node): node is SimulatedNode => node !== null)
}

async function main(): Promise<number> {
  const parsed = parseOptions(process.argv.slice(2), process.env)
  if (parsed === 'help') {
    console.log(USAGE)
    return 0
  }
  const options = parsed
  const stop = new AbortController()
  let looping = false
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.on(signal, () => {
      // Before the loop nothing is open that needs closing; a second signal means "now".
      if (!looping || stop.signal.aborted) {
        log(`${signal}: exiting`)
        process.exit(0)
      }
      log(`${signal}: stopping`)
      stop.abort()
    })
  }

  const api = createApiClient(options.url)
  log(`waiting for ${options.url}`)
  await waitForApi(api, log)
  const tanks = await provisionDevices(api, {
    email: options.email,
    password: options.password,
    intervalSeconds: Math.max(1, Math.round(options.intervalS)),
    tankLimit: options.tanks ?? undefined,
    log,
  })
  for (const name of options.scenarios.keys()) {
    if (!tanks.some((t) => t.spec.name === name)) log(`scenario for unknown tank '${name}' ignored`)
  }
  const nodes = await buildNodes(options, tanks)
  log(`${nodes.length} nodes over ${options.transport}, every ${options.intervalS} s, speed ×${options.speed}`)
  if (stop.signal.aborted || nodes.length === 0) return nodes.length === 0 && tanks.length > 0 ? 1 : 0

  looping = true
  try {
    await runLoop(nodes, { ...options, log, signal: stop.signal })
  } finally {
    await Promise.allSettled(nodes.map((node) => node.transport.close()))
    log('stopped')
  }
  return 0
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`[simulator] ${(err as Error).message}`)
    process.exit(1)
  },
)
