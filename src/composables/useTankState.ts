import { onScopeDispose, shallowRef, watch } from 'vue'
import type { WallTank } from '@shared/schemas/wall'
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

  watch(() => JSON.stringify(source()), () => {
    state.value = null
    void load()
  }, { immediate: true })
  const timer = setInterval(() => void load(), WALL_REFRESH_MS)
  onScopeDispose(() => {
    clearInterval(timer)
    ticket++
  })
  return state
}
