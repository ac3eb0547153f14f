import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'

vi.mock('@/api/series', () => ({ getSeries: vi.fn(), getLatest: vi.fn() }))

import { getSeries } from '@/api/series'
import { ApiError } from '@/api/errors'
import MetricPanel from '@/components/charts/MetricPanel.vue'
import { presetRange } from '@/components/charts/ranges'
import { mountView } from './mount'

const empty: SeriesResponse = {
  metric: 'ph',
  unit: 'pH',
  from: '2026-03-02T12:00:00.000Z',
  to: '2026-03-03T12:00:00.000Z',
  bucketSeconds: 0,
  points: [],
  raw: [],
}

function mountPanel() {
  return mountView(MetricPanel, {
    props: { tankId: 12, metric: 'ph', range: presetRange('24h', Date.parse('2026-03-03T12:00:00.000Z')), band: { min: 6.5, max: 7.5 }, timeZone: 'UTC' },
  })
}

beforeEach(() => vi.mocked(getSeries).mockReset())

describe('MetricPanel', () => {
  it('shows a skeleton while fetching, then says when the range is empty', async () => {
    let answer: (value: SeriesResponse) => void = () => undefined
    vi.mocked(getSeries).mockReturnValue(new Promise((resolve) => (answer = resolve)))
    const { wrapper } = await mountPanel()
    expect(wrapper.find('.v-skeleton-loader').exists()).toBe(true)
    expect(getSeries).toHaveBeenCalledWith(12, expect.objectContaining({ metric: 'ph', points: 600 }))
    answer(empty)
    await flushPromises()
    expect(wrapper.find('.v-skeleton-loader').exists()).toBe(false)
    expect(wrapper.text()).toContain('No readings in this range')
  })

  it('offers a retry after an error and draws the chart when it works', async () => {
    vi.mocked(getSeries).mockRejectedValueOnce(new ApiError({ status: 503, code: 'unavailable', message: 'The database is not answering' }))
    const { wrapper } = await mountPanel()
    await flushPromises()
    expect(wrapper.text()).toContain('The database is not answering')

    vi.mocked(getSeries).mockResolvedValueOnce({
      ...empty,
      raw: [
        { t: '2026-03-03T11:00:00.000Z', value: 7.1, source: 'device' },
        { t: '2026-03-03T11:05:00.000Z', value: 7.2, source: 'device' },
      ],
    })
    await wrapper
      .findAll('button')
      .find((b) => b.text() === 'Retry')!
      .trigger('click')
    await flushPromises()
    expect(wrapper.find('[aria-label="pH chart"]').exists()).toBe(true)
    expect(wrapper.text()).toContain('every reading')
  })
})
