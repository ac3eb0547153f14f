import { onScopeDispose, ref, shallowRef, watch } from 'vue'
import type { WallResponse } from '@shared/schemas/wall'
import { ApiError, describeError } from '@/api/errors'
import { getWall } from '@/api/wall'

/** State changes (incidents, quiet devices) come with the payload; readings come live in between. */
export const WALL_REFRESH_MS = 60_000

export function useWall(siteId: () => number) {
  const wall = shallowRef<WallResponse | null>(null)
  const error = ref<string | null>(null)
  const notAllowed = ref(false)
  /** When the last good payload arrived, if a refresh since then failed. */
  const staleSince = ref<string | null>(null)
  let lastGoodAt: string | null = null
  let timer: ReturnType<typeof setInterval> | null = null
  let ticket = 0

  async function load() {
    const mine = ++ticket
    const id = siteId()
    try {
      const payload = await getWall(id)
      if (mine !== ticket) return
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

  watch(
    siteId,
    () => {
      wall.value = null
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

  return { wall, error, notAllowed, staleSince, reload: load }
}
