import { onScopeDispose, watch } from 'vue'
import { useLiveStore } from '@/stores/live'
import { subscribeLive, useLiveSocket, type LiveTarget } from './useLiveSocket'

/** Keeps the live store fed for a target while the calling component lives; null pauses. */
export function useLiveFeed(target: () => LiveTarget | null) {
  const live = useLiveStore()
  const { status } = useLiveSocket()
  let stop: (() => void) | null = null

  watch(
    () => JSON.stringify(target()),
    () => {
      stop?.()
      stop = null
      const current = target()
      if (current && ('siteId' in current || current.tankIds.length)) stop = subscribeLive(current, (readings) => live.ingest(readings))
    },
    { immediate: true },
  )
  onScopeDispose(() => {
    stop?.()
    stop = null
  })
  return { status, live }
}
