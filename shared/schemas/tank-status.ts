import type { LatestResponse } from './series'

/** Most urgent first; `no_sensor` is a tank with no device and no reading, so nothing says it is well. */
export const TANK_STATES = ['alarm', 'watch', 'quiet', 'no_sensor', 'steady'] as const
export type TankState = (typeof TANK_STATES)[number]

/** What the wall and the tanks list say about a tank now. */
export interface TankStatus {
  state: TankState
  stateReasons: string[]
  latest: LatestResponse
  /** Unresolved incidents, newest first. */
  openIncidents: Array<{
    id: number
    title: string
    severity: 'warning' | 'alarm'
    openedAt: string
    state: 'open' | 'acknowledged'
    maintenance: boolean
    siteIncidentId: number | null
    flapCount: number
  }>
  /** Names of the tank's devices that have stopped reporting (none for an empty or archived tank). */
  quietDevices: string[]
  hasDevices: boolean
}
