import { createPinia, setActivePinia } from 'pinia'
import { beforeEach, describe, expect, it } from 'vitest'
import type { LiveReading } from '@shared/schemas/live'
import { LIVE_MAX_AGE_MS, LIVE_POINTS_PER_SERIES, mergeLatest, useLiveStore } from '@/stores/live'

const at = (ms: number, value = 25, tankId = 1): LiveReading => ({ tankId, metric: 'temperature', time: new Date(ms).toISOString(), value, source: 'device' })
const start = Date.parse('2026-03-03T00:00:00.000Z')

beforeEach(() => setActivePinia(createPinia()))

describe('live store', () => {
  it('keeps points in time order, drops a repeated reading, and tracks the latest value', () => {
    const live = useLiveStore()
    live.ingest([at(start + 2000, 25.2), at(start, 25.0)])
    live.ingest([at(start + 1000, 25.1), at(start + 2000, 25.2)])
    expect(live.pointsFor(1, 'temperature').map((p) => p.value)).toEqual([25.0, 25.1, 25.2])
    expect(live.latestFor(1).temperature?.value).toBe(25.2)
    live.ingest([at(start - 5000, 24)])
    expect(live.latestFor(1).temperature?.value).toBe(25.2)
  })

  it(`caps each series at ${LIVE_POINTS_PER_SERIES} points and ${LIVE_MAX_AGE_MS / 3_600_000} hours`, () => {
    const live = useLiveStore()
    live.ingest(Array.from({ length: LIVE_POINTS_PER_SERIES + 50 }, (_, i) => at(start + i * 1000)))
    const points = live.pointsFor(1, 'temperature')
    expect(points).toHaveLength(LIVE_POINTS_PER_SERIES)
    expect(points[0]!.ms).toBe(start + 50_000)

    live.ingest([at(start + LIVE_MAX_AGE_MS + 100_000)])
    expect(live.pointsFor(1, 'temperature')[0]!.ms).toBeGreaterThanOrEqual(start + 100_000)
  })

  it('ignores metrics it does not know and merges latest values by time', () => {
    const live = useLiveStore()
    live.ingest([{ ...at(start), metric: 'turbidity' }])
    expect(live.latestFor(1)).toEqual({})
    const older = { value: 7, time: '2026-03-03T00:00:00.000Z', source: 'device' as const }
    const newer = { value: 7.2, time: '2026-03-03T00:01:00.000Z', source: 'device' as const }
    expect(mergeLatest({ ph: newer }, { ph: older }).ph).toBe(newer)
    expect(mergeLatest({ ph: older }, { ph: newer, kh: older }).ph).toBe(newer)
  })
})
