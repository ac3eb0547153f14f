import { computed, ref, shallowRef, watch } from 'vue'
import type { MetricKey } from '@shared/metrics/registry'
import { METRIC_KEYS } from '@shared/metrics/registry'
import type { LatestResponse } from '@shared/schemas/series'
import { describeError } from '@/api/errors'
import { getLatest } from '@/api/series'
import { mergeLatest } from '@/stores/live'
import { useLiveFeed } from './useLiveFeed'

/** The tank's newest value per metric: the API's snapshot, then whatever the socket brings. */
export function useTankLatest(tankId: () => number) {
  const snapshot = shallowRef<LatestResponse>({})
  const loading = ref(true)
  const error = ref<string | null>(null)
  const { live, status } = useLiveFeed(() => ({ tankIds: [tankId()] }))
  let ticket = 0

  async function load() {
    const mine = ++ticket
    loading.value = true
    error.value = null
    try {
      const latest = await getLatest(tankId())
      if (mine === ticket) snapshot.value = latest
    } catch (failure) {
      if (mine === ticket) error.value = describeError(failure)
    } finally {
      if (mine === ticket) loading.value = false
    }
  }
  watch(
    tankId,
    () => {
      snapshot.value = {}
      void load()
    },
    { immediate: true },
  )

  const latest = computed(() => mergeLatest(snapshot.value, live.latestFor(tankId())))
  const metrics = computed<MetricKey[]>(() => METRIC_KEYS.filter((m) => latest.value[m]))
  return { latest, metrics, loading, error, status, reload: load }
}
