import { onScopeDispose, shallowRef, watch } from 'vue'
import type { LatestResponse } from '@shared/schemas/series'
import type { TankState } from '@shared/schemas/tank-status'
import type { WallTank } from '@shared/schemas/wall'
import { tankState } from '@shared/tank-state'
import { STATE_LOOKS } from '@/components/wall/tile-format'
import { mergeLatest } from '@/stores/live'
import { announce } from './useAnnouncer'
import { getWall } from '@/api/wall'
import { WALL_REFRESH_MS } from './useWall'

/**
 * A tank's state comes from its site's wall payload (there is no per-tank state endpoint yet).
 * Without it the header simply shows no state; nothing else depends on it.
 */
export function useTankState(source: () => { tankId: number; siteId: number } | null) {
  const state = shallowRef<WallTank | null>(null)
  let ticket = 0

  async function load() {
    const target = source()
    const mine = ++ticket
    if (!target) return
    try {
      const wall = await getWall(target.siteId)
      if (mine === ticket) state.value = wall.tanks.find((t) => t.id === target.tankId) ?? null
    } catch {
      if (mine === ticket) state.value = null
    }
  }

  watch(
    () => JSON.stringify(source()),
    () => {
      state.value = null
      void load()
    },
    { immediate: true },
  )
  const timer = setInterval(() => void load(), WALL_REFRESH_MS)
  onScopeDispose(() => {
    clearInterval(timer)
    ticket++
  })
  return state
}

/**
 * The wall's view of the tank with the page's newer readings applied by the wall's own rule, so a
 * reading crossing into or out of its band moves the state at once. An open alarm or a silent
 * device decides the state whatever the readings say; the next fetch settles those.
 */
export function withNewerReadings(wall: WallTank | null, latest: LatestResponse): WallTank | null {
  if (!wall || wall.state === 'alarm' || wall.state === 'quiet') return wall
  const decided: { state: TankState; reasons: string[] } = tankState({
    latest: mergeLatest(wall.latest, latest),
    targets: wall.targets,
    openIncidents: wall.openIncident ? [wall.openIncident] : [],
    quietDevices: [],
    // A tank without a sensor stays so until a reading (a test-kit entry, say) arrives.
    hasDevices: wall.state !== 'no_sensor',
  })
  return { ...wall, state: decided.state, stateReasons: decided.reasons }
}

/** "Reef display is now Watch: temperature 28.4 outside 24–28.": a change of state, read out politely. */
export function stateAnnouncement(tank: Pick<WallTank, 'name' | 'state' | 'stateReasons'>): string {
  const reasons = tank.stateReasons.length ? `: ${tank.stateReasons.join('; ')}` : ''
  return `${tank.name} is now ${STATE_LOOKS[tank.state].word}${reasons}.`
}

/** Announces each change of the tank's state; the state shown on opening the page is not a change. */
export function announceStateChanges(source: () => WallTank | null) {
  watch(
    () => {
      const tank = source()
      return tank ? `${tank.id}:${tank.state}` : null
    },
    (now, before) => {
      const tank = source()
      if (!tank || !now || !before || now.split(':')[0] !== before.split(':')[0]) return
      announce(stateAnnouncement(tank))
    },
  )
}
