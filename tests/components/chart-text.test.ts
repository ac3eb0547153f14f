import { flushPromises } from '@vue/test-utils'
import { beforeEach, describe, expect, it, vi } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'

vi.mock('@/api/series', () => ({ getSeries: vi.fn(), getLatest: vi.fn() }))

import { getSeries } from '@/api/series'
import { describeChart, metricChartRows } from '@/components/charts/chart-text'
import MetricPanel from '@/components/charts/MetricPanel.vue'
import { presetRange } from '@/components/charts/ranges'
import { mountView } from './mount'

const FROM = '2026-03-02T12:00:00.000Z'
const TO = '2026-03-03T12:00:00.000Z'
const raw: SeriesResponse = {
  metric: 'temperature',
  unit: '°C',
  from: FROM,
  to: TO,
  bucketSeconds: 0,
  points: [],
  raw: [
    { t: '2026-03-03T10:00:00.000Z', value: 25.4, source: 'device' },
    { t: '2026-03-03T10:30:00.000Z', value: 24.9, source: 'test_kit' },
    { t: '2026-03-03T11:00:00.000Z', value: 25.8, source: 'device' },
  ],
}
const format = (v: number) => `${v.toFixed(1)} °C`

beforeEach(() => {
  vi.mocked(getSeries).mockReset()
})

describe('a chart in words', () => {
  it('says the latest value, the lowest and highest shown and the time span, on the site clock', () => {
    const text = { subject: 'Temperature', timeZone: 'Europe/Berlin', format, ...metricChartRows({ series: raw }) }
    expect(describeChart(text)).toBe('Temperature: latest 25.8 °C at 3 Mar, 12:00 CET. Shown 24.9 °C to 25.8 °C, from 2 Mar, 13:00 CET to 3 Mar, 13:00 CET.')
  })

  it('says so once when every value shown is the same', () => {
    const steady = { ...raw, raw: raw.raw.map((r) => ({ ...r, value: 25 })) }
    const text = { subject: 'Temperature', timeZone: 'UTC', format, ...metricChartRows({ series: steady }) }
    expect(describeChart(text)).toBe('Temperature: latest 25.0 °C at 3 Mar, 11:00 UTC. Shown every value 25.0 °C, from 2 Mar, 12:00 UTC to 3 Mar, 12:00 UTC.')
  })

  it('says when there is nothing in the span', () => {
    const text = { subject: 'pH', timeZone: 'UTC', format, ...metricChartRows({ series: { ...raw, raw: [] } }) }
    expect(describeChart(text)).toBe('pH: no readings from 2 Mar, 12:00 UTC to 3 Mar, 12:00 UTC.')
  })

  it('gives bucketed series their mean, lowest and highest, and test-kit readings as rows of their own', () => {
    const bucketed: SeriesResponse = {
      ...raw,
      bucketSeconds: 3600,
      raw: [],
      points: [{ t: '2026-03-03T10:00:00.000Z', mean: 25.5, min: 25.1, max: 25.9, count: 12 }],
    }
    const rows = metricChartRows({ series: bucketed, kitPoints: [{ t: '2026-03-03T11:10:00.000Z', value: 24.8 }] })
    expect(rows.columns).toEqual(['Value', 'Lowest', 'Highest'])
    expect(rows.rows).toEqual([
      { t: Date.parse('2026-03-03T10:00:00.000Z'), values: [25.5, 25.1, 25.9], source: 'Sensor' },
      { t: Date.parse('2026-03-03T11:10:00.000Z'), values: [24.8, null, null], source: 'Test kit' },
    ])
  })
})

describe('the tank page chart', () => {
  async function mountPanel() {
    vi.mocked(getSeries).mockResolvedValue(raw)
    const mounted = await mountView(MetricPanel, { props: { tankId: 3, metric: 'temperature', range: presetRange('24h', Date.parse(TO)), timeZone: 'UTC' } })
    await flushPromises()
    return mounted.wrapper
  }

  it('describes the chart image by its summary', async () => {
    const wrapper = await mountPanel()
    const image = wrapper.find('[role=img]')
    expect(image.attributes('aria-label')).toBe('Temperature chart')
    const description = wrapper.find(`#${image.attributes('aria-describedby')}`)
    expect(description.text()).toBe('Temperature: latest 25.8 °C at 3 Mar, 11:00 UTC. Shown 24.9 °C to 25.8 °C, from 2 Mar, 12:00 UTC to 3 Mar, 12:00 UTC.')
  })

  it('shows its points as a table with a caption on request, and hides it again', async () => {
    const wrapper = await mountPanel()
    const toggle = wrapper.find('[data-test=chart-table-toggle]')
    expect(toggle.attributes('aria-expanded')).toBe('false')
    expect(wrapper.find('table').exists()).toBe(false)
    await toggle.trigger('click')
    expect(toggle.attributes('aria-expanded')).toBe('true')
    expect(toggle.text()).toBe('Hide table')
    const table = wrapper.find('[data-test=chart-table] table')
    expect(table.find('caption').text()).toBe('Temperature, every reading; times in UTC')
    expect(table.findAll('thead th').map((th) => th.text())).toEqual(['Time', 'Reading', 'Source'])
    expect(table.findAll('tbody tr').map((tr) => tr.findAll('th, td').map((c) => c.text()))).toEqual([
      ['3 Mar, 10:00 UTC', '25.4 °C', 'Sensor'],
      ['3 Mar, 10:30 UTC', '24.9 °C', 'Test kit'],
      ['3 Mar, 11:00 UTC', '25.8 °C', 'Sensor'],
    ])
    await toggle.trigger('click')
    expect(wrapper.find('table').exists()).toBe(false)
  })
})

describe('the report chart', () => {
  it('has the same text alternative, and leaves steps without readings out of its table', async () => {
    const { default: ReportMetricCard } = await import('@/components/report/ReportMetricCard.vue')
    const hour = 3_600_000
    const from = Date.parse('2026-03-02T00:00:00.000Z')
    const metric = {
      metric: 'temperature' as const,
      label: 'Temperature',
      unitLabel: '°C',
      band: { min: 24, max: 27 },
      readings: 3,
      coveragePercent: 50,
      timeInBandPercent: 100,
      belowMs: 0,
      aboveMs: 0,
      min: 25.1,
      max: 25.9,
      mean: 25.5,
      gapLimitMs: hour,
      gaps: [],
      series: [
        [from + hour / 2, 25.1],
        [from + 1.5 * hour, null],
        [from + 2.5 * hour, 25.9],
      ] as Array<[number, number | null]>,
    }
    const { wrapper } = await mountView(ReportMetricCard, {
      props: { metric, from: '2026-03-02T00:00:00.000Z', to: '2026-03-02T03:00:00.000Z', timeZone: 'UTC' },
    })
    expect(wrapper.find('[data-test=chart-description]').text()).toBe(
      'Temperature: latest 25.9 °C at 2 Mar, 02:30 UTC. Shown 25.1 °C to 25.9 °C, from 2 Mar, 00:00 UTC to 2 Mar, 03:00 UTC.',
    )
    await wrapper.find('[data-test=chart-table-toggle]').trigger('click')
    expect(wrapper.find('caption').text()).toBe('Temperature: mean per step of the period, steps without readings left out; times in UTC')
    expect(wrapper.findAll('tbody tr').map((tr) => tr.findAll('th, td').map((c) => c.text()))).toEqual([
      ['2 Mar, 00:30 UTC', '25.1 °C'],
      ['2 Mar, 02:30 UTC', '25.9 °C'],
    ])
  })
})
