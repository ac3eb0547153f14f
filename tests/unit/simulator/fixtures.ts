import type { SimTankSpec } from '../../../simulator/model/spec'
import { TankSimulation, type TankSimulationOptions } from '../../../simulator/model/tank'

/** 15 January 2024, 00:00 Europe/Berlin (CET, UTC+1). */
export const WINTER_MIDNIGHT_BERLIN = Date.UTC(2024, 0, 14, 23, 0)
export const HOUR_S = 3600

export function spec(overrides: Partial<SimTankSpec> = {}): SimTankSpec {
  return {
    name: 'Test tank',
    kind: 'tropical_freshwater',
    dimensions: null,
    volumeLitres: 60,
    heater: { watts: 100, setPointC: 26, topCm: 20 },
    lightSchedule: { on: '09:00', off: '20:00' },
    timeZone: 'Europe/Berlin',
    ...overrides,
  }
}

export function simulate(overrides: Partial<SimTankSpec>, options: Partial<TankSimulationOptions> = {}) {
  return new TankSimulation(spec(overrides), { seed: 7, startMs: WINTER_MIDNIGHT_BERLIN, ...options })
}

/** Samples `read()` every `everyS` simulated seconds for `forS` seconds. */
export function sample<T>(sim: TankSimulation, forS: number, everyS: number, read: () => T): T[] {
  const out: T[] = []
  for (let t = 0; t < forS; t += everyS) {
    sim.advance(everyS)
    out.push(read())
  }
  return out
}
