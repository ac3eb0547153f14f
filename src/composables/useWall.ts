import { onScopeDispose, ref, shallowRef, triggerRef, watch } from 'vue'
import { MAX_TREND_TANKS, type WallResponse, type WallTank, type WallTrendPoint } from '@shared/schemas/wall'
import { setClockStyle } from '@shared/time'
import { ApiError, describeError } from '@/api/errors'
import { fetchWallTrends, getWall } from '@/api/wall'

/** State changes (incidents, quiet devices) come with the payload; readings come live in between. */
export const WALL_REFRESH_MS = 60_000
/** A trend line asked for by page is asked for again when its page comes up after this long (live points fill it meanwhile). */
export const TREND_KEPT_MS = 5 * 60_000

export function useWall(siteId: () => number) {
  const wall = shallowRef<WallResponse | null>(null)
  const error = ref<string | null>(null)
  const notAllowed = ref(false)
  /** When the last good payload arrived, if a refresh since then failed. */
  const staleSince = ref<string | null>(null)
  let lastGoodAt: string | null = null
  let timer: ReturnType<typeof setInterval> | null = null
  let ticket = 0
  /** Trend lines the wall's answer left out, asked for as their tanks come on screen. */
  const trends = shallowRef(new Map<number, { line: WallTrendPoint[]; at: number }>())
  const asking = new Set<number>()

  async function load() {
    const mine = ++ticket
    const id = siteId()
    try {
      const payload = await getWall(id)
      if (mine !== ticket) return
      const at = Date.now()
      for (const tank of payload.tanks) if (tank.trend) trends.value.set(tank.id, { line: tank.trend, at })
      // A display has no signed-in person to carry the organisation's clock: the wall brings it.
      setClockStyle(payload.site.clockStyle)
      wall.value = payload
      error.value = null
      staleSince.value = null
      notAllowed.value = false
      lastGoodAt = new Date().toISOString()
    } catch (failure) {
      if (mine !== ticket) return
      notAllowed.value = failure instanceof ApiError && (failure.status === 401 || failure.status === 403 || failure.status === 404)
      error.value = notAllowed.value ? 'This display may not show this site. Ask an owner for a new wall link.' : describeError(failure)
      staleSince.value = lastGoodAt
    }
  }

  /** The tank with its trend line: from the wall's answer, else as asked for by page (null until it comes). */
  function withTrend(tank: WallTank): WallTank {
    return tank.trend ? tank : { ...tank, trend: trends.value.get(tank.id)?.line ?? null }
  }

  /** Asks for the trend lines of these tanks that the wall has not got, or got too long ago. */
  async function showTrends(tankIds: number[]) {
    const id = siteId()
    const now = Date.now()
    const wanted = tankIds.filter((tankId) => !asking.has(tankId) && now - (trends.value.get(tankId)?.at ?? -Infinity) > TREND_KEPT_MS)
    for (let i = 0; i < wanted.length; i += MAX_TREND_TANKS) {
      const batch = wanted.slice(i, i + MAX_TREND_TANKS)
      batch.forEach((tankId) => asking.add(tankId))
      try {
        const answer = await fetchWallTrends(id, batch)
        if (id !== siteId()) return
        for (const { tankId, trend } of answer.trends) trends.value.set(tankId, { line: trend, at: Date.now() })
        triggerRef(trends)
      } catch {
        // The tile keeps its live points; the line is asked for again the next time its page comes up.
      } finally {
        batch.forEach((tankId) => asking.delete(tankId))
      }
    }
  }

  watch(
    siteId,
    () => {
      wall.value = null
      trends.value = new Map()
      lastGoodAt = null
      void load()
    },
    { immediate: true },
  )
  timer = setInterval(() => void load(), WALL_REFRESH_MS)
  onScopeDispose(() => {
    if (timer) clearInterval(timer)
    ticket++
  })

  return { wall, error, notAllowed, staleSince, reload: load, withTrend, showTrends }
}
