// One simulated node per provisioned tank: its physics, its fault plan and its connection.
import { FaultyOutbox } from './model/faults'
import { mulberry32, seedFrom } from './model/random'
import { NO_SCENARIO } from './model/scenarios'
import { TankSimulation } from './model/tank'
import type { SimulatorOptions } from './options'
import type { ProvisionedTank } from './provision'
import type { SimulatedNode } from './runner'
import { createHttpTransport } from './transport/http'
import { createMqttTransport } from './transport/mqtt'
import type { Transport } from './transport/types'

type NodeOptions = Pick<SimulatorOptions, 'transport' | 'url' | 'mqttUrl' | 'scenarios' | 'seed' | 'speed'>

async function transportFor(options: NodeOptions, tank: ProvisionedTank, log: (line: string) => void): Promise<Transport> {
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

/** Connects every tank's node; a node that cannot connect is left out (and said so). */
export async function buildNodes(options: NodeOptions, tanks: ProvisionedTank[], log: (line: string) => void, startMs = Date.now()): Promise<SimulatedNode[]> {
  const built = await Promise.all(
    tanks.map(async (tank): Promise<SimulatedNode | null> => {
      const plan = options.scenarios.get(tank.spec.name) ?? NO_SCENARIO
      const seed = seedFrom(options.seed, tank.tankId)
      const outbox =
        plan.scenario === 'malformed' || plan.scenario === 'duplicates_and_out_of_order'
          ? new FaultyOutbox(plan.scenario, mulberry32(seedFrom(seed, 'outbox')))
          : null
      try {
        const transport = await transportFor(options, tank, log)
        const sim = new TankSimulation(tank.spec, { seed, startMs, plan, speed: options.speed })
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
