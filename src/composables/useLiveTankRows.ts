import { computed } from 'vue'
import type { LatestValue } from '@shared/schemas/series'
import type { TankListItem } from '@shared/schemas/tanks'
import type { TankState, TankStatus } from '@shared/schemas/tank-status'
import { tankState } from '@shared/tank-state'
import { mergeLatest } from '@/stores/live'
import { useIncidentRefresh } from './useIncidentRefresh'
import { useLiveFeed } from './useLiveFeed'

export interface LiveTankRow {
  tank: TankListItem
  state: TankState
  temperature: LatestValue | null
  ph: LatestValue | null
  openIncidents: TankStatus['openIncidents']
}

/**
 * The rows of a tanks list kept live: readings from the socket move the values (and, through the
 * same rule the wall uses, the state) at once; an incident opening, changing or closing on one of
 * the tanks refetches the page, as does the minute's refetch that catches devices falling quiet.
 */
export function useLiveTankRows(items: () => TankListItem[], refresh: () => void) {
  const ids = computed(() => items().map((tank) => tank.id))
  const { live } = useLiveFeed(() => ({ tankIds: ids.value }))
  useIncidentRefresh(() => (ids.value.length ? [{ tankIds: ids.value }] : []), refresh)

  const rows = computed(() =>
    items().map((tank): LiveTankRow => {
      const latest = mergeLatest(tank.status.latest, live.latestFor(tank.id))
      const { state } = tankState({
        latest,
        targets: tank.targets,
        openIncidents: tank.status.openIncidents,
        quietDevices: tank.status.quietDevices,
        hasDevices: tank.status.hasDevices,
      })
      return { tank, state, temperature: latest.temperature ?? null, ph: latest.ph ?? null, openIncidents: tank.status.openIncidents }
    }),
  )
  return { rows }
}
