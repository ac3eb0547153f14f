import { afterEach, describe, expect, it, vi } from 'vitest'
import VChart from 'vue-echarts'
import MetricChart from '@/components/charts/MetricChart.vue'
import type { ChartText } from '@/components/charts/chart-text'
import type { MetricChartOption } from '@/components/charts/options'
import { mountView } from './mount'

// Someone whose system asks for less motion gets charts that never animate (Web Content
// Accessibility Guidelines 2.1, success criterion 2.3.3 Animation from Interactions, W3C, 2018).

const text: ChartText = { subject: 'Temperature', from: 0, to: 3_600_000, timeZone: 'UTC', columns: ['Reading'], rows: [], format: (v) => `${v} °C` }
const option = { animation: true, series: [] } as MetricChartOption

function systemAsksForLessMotion(reduce: boolean) {
  vi.stubGlobal('matchMedia', (query: string) => ({
    matches: reduce && query === '(prefers-reduced-motion: reduce)',
    media: query,
    addEventListener: () => undefined,
    removeEventListener: () => undefined,
  }))
}
afterEach(() => {
  vi.unstubAllGlobals()
})

describe('charts and reduced motion', () => {
  it('draws without animation when the system asks for less motion', async () => {
    systemAsksForLessMotion(true)
    const { wrapper } = await mountView(MetricChart, { props: { option, text, label: 'Temperature chart' } })
    expect((wrapper.findComponent(VChart).props('option') as MetricChartOption).animation).toBe(false)
  })

  it('leaves the chart as its option says otherwise', async () => {
    systemAsksForLessMotion(false)
    const { wrapper } = await mountView(MetricChart, { props: { option, text, label: 'Temperature chart' } })
    expect((wrapper.findComponent(VChart).props('option') as MetricChartOption).animation).toBe(true)
  })
})
