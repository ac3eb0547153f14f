import { onScopeDispose, watch } from 'vue'
import { subscribeLive, type LiveIncidentChange, type LiveTarget } from './useLiveSocket'

/** The live socket says what changed; a full refetch every minute catches anything it missed. */
export const INCIDENT_REFETCH_MS = 60_000
/** Several frames in a burst (open, mail, escalate) become one refetch. */
const COALESCE_MS = 400

/** Calls `reload` when an incident of the targets changes, and every minute regardless. */
export function useIncidentRefresh(targets: () => LiveTarget[], reload: () => void, onChange?: (change: LiveIncidentChange) => void) {
  let stops: Array<() => void> = []
  let pending: ReturnType<typeof setTimeout> | null = null

  const schedule = (change: LiveIncidentChange) => {
    onChange?.(change)
    if (pending) return
    pending = setTimeout(() => {
      pending = null
      reload()
    }, COALESCE_MS)
  }
  const ignoreReadings = () => undefined

  watch(
    () => JSON.stringify(targets()),
    () => {
      for (const stop of stops) stop()
      stops = targets().map((target) => subscribeLive(target, ignoreReadings, schedule))
    },
    { immediate: true },
  )
  const timer = setInterval(reload, INCIDENT_REFETCH_MS)

  onScopeDispose(() => {
    for (const stop of stops) stop()
    stops = []
    clearInterval(timer)
    if (pending) clearTimeout(pending)
  })
}
