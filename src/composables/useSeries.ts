import { ref, shallowRef, watch } from 'vue'
import type { MetricKey } from '@shared/metrics/registry'
import type { SeriesResponse, SeriesValues } from '@shared/schemas/series'
import { describeError } from '@/api/errors'
import { getSeries } from '@/api/series'
import type { TimeRange } from '@/components/charts/ranges'

/** One metric's series for a range; only the newest request may write. */
export function useSeries(source: () => { tankId: number; metric: MetricKey; range: TimeRange; points: number; values?: SeriesValues }) {
  const data = shallowRef<SeriesResponse | null>(null)
  const loading = ref(false)
  const error = ref<string | null>(null)
  let ticket = 0

  async function load() {
    const mine = ++ticket
    const { tankId, metric, range, points, values } = source()
    loading.value = true
    error.value = null
    try {
      const series = await getSeries(tankId, { metric, from: range.from, to: range.to, points, values })
      if (mine === ticket) data.value = series
    } catch (failure) {
      if (mine === ticket) error.value = describeError(failure)
    } finally {
      if (mine === ticket) loading.value = false
    }
  }

  watch(
    () => {
      const s = source()
      return `${s.tankId}|${s.metric}|${s.range.from.getTime()}|${s.range.to.getTime()}|${s.points}|${s.values ?? 'corrected'}`
    },
    () => void load(),
    { immediate: true },
  )

  return { data, loading, error, reload: load }
}
