import { acceptHMRUpdate, defineStore } from 'pinia'
import { ref, shallowRef, triggerRef } from 'vue'
import { isMetricKey, type MetricKey } from '@shared/metrics/registry'
import type { LiveReading } from '@shared/schemas/live'
import type { LatestValue } from '@shared/schemas/series'

/** Enough for several hours of one-minute readings per metric without growing without bound. */
export const LIVE_POINTS_PER_SERIES = 2000
/**
 * Live points only bridge the time since the last fetch (the wall refetches every minute, charts
 * every few); a TV left on for weeks must not hoard more than this per series.
 */
export const LIVE_MAX_AGE_MS = 6 * 3_600_000

export interface LivePoint {
  t: string
  /** Milliseconds since the epoch, for cheap comparisons and charts. */
  ms: number
  value: number
  source: LiveReading['source']
}

type TankLatest = Partial<Record<MetricKey, LatestValue>>

const seriesKey = (tankId: number, metric: MetricKey) => `${tankId}:${metric}`

/** Inserts in time order; a catch-up may resend a reading the socket already delivered. */
function insertPoint(points: LivePoint[], point: LivePoint): boolean {
  let index = points.length
  while (index > 0 && points[index - 1]!.ms > point.ms) index--
  const before = points[index - 1]
  if (before && before.ms === point.ms && before.value === point.value) return false
  points.splice(index, 0, point)
  if (points.length > LIVE_POINTS_PER_SERIES) points.splice(0, points.length - LIVE_POINTS_PER_SERIES)
  const oldestKept = points[points.length - 1]!.ms - LIVE_MAX_AGE_MS
  let stale = 0
  while (stale < points.length && points[stale]!.ms < oldestKept) stale++
  if (stale) points.splice(0, stale)
  return true
}

export const useLiveStore = defineStore('live', () => {
  // Buffers are plain arrays behind one shallow ref: 200 tanks × several metrics × 2 000 points
  // must not become deep reactive proxies. Readers depend on `revision`.
  const buffers = shallowRef(new Map<string, LivePoint[]>())
  const latest = ref<Record<number, TankLatest>>({})
  const revision = ref(0)
  const lastReadingAt = ref<string | null>(null)

  function ingest(readings: LiveReading[]) {
    let changed = false
    for (const reading of readings) {
      if (!isMetricKey(reading.metric) || !Number.isFinite(reading.value)) continue
      const metric = reading.metric
      const key = seriesKey(reading.tankId, metric)
      let points = buffers.value.get(key)
      if (!points) buffers.value.set(key, (points = []))
      const ms = Date.parse(reading.time)
      if (!Number.isFinite(ms)) continue
      changed = insertPoint(points, { t: reading.time, ms, value: reading.value, source: reading.source }) || changed

      const tank = (latest.value[reading.tankId] ??= {})
      const known = tank[metric]
      if (!known || Date.parse(known.time) <= ms) tank[metric] = { value: reading.value, time: reading.time, source: reading.source }
      if (!lastReadingAt.value || reading.time > lastReadingAt.value) lastReadingAt.value = reading.time
    }
    if (changed) {
      revision.value++
      triggerRef(buffers)
    }
  }

  /** Points after `afterMs` (exclusive), oldest first. */
  function pointsFor(tankId: number, metric: MetricKey, afterMs = -Infinity): LivePoint[] {
    void revision.value
    const points = buffers.value.get(seriesKey(tankId, metric)) ?? []
    if (afterMs === -Infinity) return points.slice()
    return points.filter((p) => p.ms > afterMs)
  }

  function latestFor(tankId: number): TankLatest {
    return latest.value[tankId] ?? {}
  }

  function $reset() {
    buffers.value = new Map()
    latest.value = {}
    revision.value = 0
    lastReadingAt.value = null
  }

  return { latest, revision, lastReadingAt, ingest, pointsFor, latestFor, $reset }
})

/** The newer of two latest values (the API's snapshot and what the socket brought since). */
export function newerValue(a: LatestValue | undefined, b: LatestValue | undefined): LatestValue | undefined {
  if (!a) return b
  if (!b) return a
  return Date.parse(b.time) > Date.parse(a.time) ? b : a
}

/** Merges two latest maps metric by metric. */
export function mergeLatest(base: TankLatest, live: TankLatest): TankLatest {
  const merged: TankLatest = { ...base }
  for (const [metric, value] of Object.entries(live)) {
    if (isMetricKey(metric)) merged[metric] = newerValue(merged[metric], value)
  }
  return merged
}

if (import.meta.hot) import.meta.hot.accept(acceptHMRUpdate(useLiveStore, import.meta.hot))
