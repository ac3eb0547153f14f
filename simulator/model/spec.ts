import type { TankKind, TankShapeInput } from '@shared/schemas/tanks'

/** What the simulator needs to know about one tank: a subset of the API's PublicTank. */
export interface SimTankSpec {
  name: string
  kind: TankKind
  dimensions: TankShapeInput | null
  volumeLitres: number
  heater: { watts: number; setPointC: number; topCm: number } | null
  lightSchedule: { on: string; off: string } | null
  /** IANA zone of the tank's site; the light schedule is wall-clock time there. */
  timeZone: string
}
