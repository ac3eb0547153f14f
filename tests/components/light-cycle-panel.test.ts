import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'

vi.mock('@/api/series', () => ({ getSeries: vi.fn() }))

import { getSeries } from '@/api/series'
import LightCyclePanel from '@/components/charts/LightCyclePanel.vue'
import { mountView } from './mount'

const HOUR = 3_600_000
// A whole UTC day two days back, so the panel's last 7 days hold it whatever the test's clock says.
const dayStart = Math.floor(Date.now() / (24 * HOUR)) * 24 * HOUR - 2 * 24 * HOUR
const date = new Date(dayStart).toISOString().slice(0, 10)

/** A reading every 10 minutes over the day: lights at 800 lux from 09:00 to 19:00 UTC, dark otherwise. */
function lightSeries(): SeriesResponse {
  const raw = []
  for (let ms = dayStart; ms < dayStart + 24 * HOUR; ms += 10 * 60_000) {
    const hour = (ms - dayStart) / HOUR
    raw.push({ t: new Date(ms).toISOString(), value: hour >= 9 && hour < 19 ? 800 : 0, source: 'device' as const })
  }
  return {
    metric: 'light',
    unit: 'lx',
    from: new Date(dayStart - 5 * 24 * HOUR).toISOString(),
    to: new Date().toISOString(),
    bucketSeconds: 0,
    points: [],
    raw,
  }
}

beforeEach(() => {
  vi.mocked(getSeries).mockResolvedValue(lightSeries())
})

describe('LightCyclePanel', () => {
  it('shows the days as a table on request: when the lights were on, for how long, the schedule and the hours covered', async () => {
    const { wrapper } = await mountView(LightCyclePanel, { props: { tankId: 3, schedule: { on: '09:00', off: '19:00' }, timeZone: 'UTC' } })
    await flushPromises()
    expect(wrapper.find('[data-test="light-table"]').exists()).toBe(false)
    const toggle = wrapper.find('[data-test="light-table-toggle"]')
    expect(toggle.text()).toBe('Show as table')
    expect(toggle.attributes('aria-expanded')).toBe('false')

    await toggle.trigger('click')
    const table = wrapper.find('[data-test="light-table"]')
    expect(table.find('caption').text()).toBe('Light cycle by day, times in UTC')
    expect(table.findAll('thead th').map((th) => th.text())).toEqual(['Day', 'Lights on (measured)', 'Scheduled', 'Readings cover'])
    const cells = wrapper
      .find(`[data-test="light-row-${date}"]`)
      .findAll('th, td')
      .map((c) => c.text())
    expect(cells.slice(1)).toEqual(['09:00–19:00 (10.0 h)', '09:00–19:00 (10.0 h)', '24.0 h'])
    expect(wrapper.find('[data-test="light-table-toggle"]').attributes('aria-expanded')).toBe('true')
    expect(wrapper.find('[data-test="light-table-toggle"]').attributes('aria-controls')).toBe(wrapper.find('[role="region"]').attributes('id'))
  })

  it('without a schedule leaves the scheduled column out and says a dark day was off all day', async () => {
    const series = lightSeries()
    vi.mocked(getSeries).mockResolvedValue({ ...series, raw: series.raw.map((r) => ({ ...r, value: 0 })) })
    const { wrapper } = await mountView(LightCyclePanel, { props: { tankId: 3, schedule: null, timeZone: 'UTC' } })
    await flushPromises()
    await wrapper.find('[data-test="light-table-toggle"]').trigger('click')
    expect(wrapper.findAll('[data-test="light-table"] thead th').map((th) => th.text())).toEqual(['Day', 'Lights on (measured)', 'Readings cover'])
    const cells = wrapper
      .find(`[data-test="light-row-${date}"]`)
      .findAll('th, td')
      .map((c) => c.text())
    expect(cells.slice(1)).toEqual(['off all day', '24.0 h'])
  })
})
