import { describe, expect, it } from 'vitest'
import type { SeriesResponse } from '@shared/schemas/series'
import { celsiusToFahrenheit } from '@shared/metrics/index'
import { SERIES_NAMES, STACK_ENVELOPE, buildMetricOption, withGaps, type MetricChartInput } from '@/components/charts/options'

const colors = { line: '#111111', envelope: '#222222', band: '#333333', kit: '#444444', text: '#555555' }

const bucketed: SeriesResponse = {
  metric: 'temperature',
  unit: 'C',
  from: '2026-03-01T00:00:00.000Z',
  to: '2026-03-01T03:00:00.000Z',
  bucketSeconds: 3600,
  points: [
    { t: '2026-03-01T00:00:00.000Z', min: 24.5, mean: 25, max: 25.5, count: 60 },
    { t: '2026-03-01T01:00:00.000Z', min: 24.8, mean: 25.2, max: 26, count: 60 },
    { t: '2026-03-01T02:00:00.000Z', min: 25, mean: 25.4, max: 25.9, count: 60 },
  ],
  raw: [],
}

const raw: SeriesResponse = {
  ...bucketed,
  bucketSeconds: 0,
  points: [],
  raw: [
    { t: '2026-03-01T00:00:00.000Z', value: 25.1, source: 'device' },
    { t: '2026-03-01T00:01:00.000Z', value: 25.2, source: 'device' },
    { t: '2026-03-01T00:01:30.000Z', value: 25.6, source: 'test_kit' },
    { t: '2026-03-01T00:02:00.000Z', value: 25.3, source: 'device' },
  ],
}

function build(overrides: Partial<MetricChartInput>) {
  return buildMetricOption({ series: bucketed, band: { min: 24, max: 27 }, unitLabel: '°C', precision: 1, timeZone: 'UTC', colors, ...overrides })
}

type AnySeries = { name?: string; type?: string; stack?: string; data?: unknown[]; areaStyle?: unknown; symbol?: string; markArea?: { data?: unknown } }
const seriesOf = (option: ReturnType<typeof build>) => option.series as AnySeries[]
const named = (option: ReturnType<typeof build>, name: string) => seriesOf(option).find((s) => s.name === name)

describe('buildMetricOption for bucketed series', () => {
  const option = build({ kitPoints: [{ t: '2026-03-01T01:30:00.000Z', value: 25.6, source: 'test_kit' }] })

  it("lists the mean first, so the zoom slider's preview is the line the chart draws, and keeps the labels inside", () => {
    expect(seriesOf(option)[0]!.name).toBe(SERIES_NAMES.mean)
    const slider = (option.dataZoom as Array<{ type: string; showDataShadow?: boolean }>).find((z) => z.type === 'slider')
    expect(slider?.showDataShadow).toBe(true)
    expect(option.grid).toMatchObject({ containLabel: true })
    expect((option.grid as { right: number }).right).toBeGreaterThanOrEqual(32)
  })

  it('draws the min–max envelope as a stacked area on the minimum', () => {
    const base = named(option, SERIES_NAMES.envelopeBase)!
    const spread = named(option, SERIES_NAMES.envelope)!
    expect(base.stack).toBe(STACK_ENVELOPE)
    expect(spread.stack).toBe(STACK_ENVELOPE)
    expect(base.areaStyle).toBeUndefined()
    expect(spread.areaStyle).toBeDefined()
    expect(base.data).toEqual([
      [Date.parse('2026-03-01T00:00:00.000Z'), 24.5],
      [Date.parse('2026-03-01T01:00:00.000Z'), 24.8],
      [Date.parse('2026-03-01T02:00:00.000Z'), 25],
    ])
    const spreads = (spread.data as Array<[number, number]>).map(([, v]) => Number(v.toFixed(6)))
    expect(spreads).toEqual([1, 1.2, 0.9])
  })

  it('draws the mean as the main line with the target band shaded', () => {
    const mean = named(option, SERIES_NAMES.mean)!
    expect((mean.data as Array<[number, number]>).map(([, v]) => v)).toEqual([25, 25.2, 25.4])
    expect(mean.markArea?.data).toEqual([[{ yAxis: 24 }, { yAxis: 27 }]])
    expect(named(option, SERIES_NAMES.sensor)).toBeUndefined()
  })

  it('keeps test-kit readings in their own series with their own symbol and legend entry', () => {
    const kit = named(option, SERIES_NAMES.kit)!
    expect(kit.type).toBe('scatter')
    expect(kit.symbol).toBe('diamond')
    expect(kit.data).toEqual([[Date.parse('2026-03-01T01:30:00.000Z'), 25.6]])
    expect((option.legend as { data: string[] }).data).toEqual([SERIES_NAMES.mean, SERIES_NAMES.envelope, SERIES_NAMES.kit])
  })

  it('offers zooming and panning inside the chart and with a slider', () => {
    expect((option.dataZoom as Array<{ type: string }>).map((z) => z.type)).toEqual(['inside', 'slider'])
  })

  it('appends live readings newer than the last bucket to the mean line only', () => {
    const withLive = build({
      livePoints: [
        { t: '2026-03-01T01:59:00.000Z', value: 30, source: 'device' },
        { t: '2026-03-01T02:30:00.000Z', value: 25.7, source: 'device' },
      ],
    })
    const mean = named(withLive, SERIES_NAMES.mean)!.data as Array<[number, number]>
    expect(mean).toHaveLength(4)
    expect(mean[3]).toEqual([Date.parse('2026-03-01T02:30:00.000Z'), 25.7])
  })
})

describe('buildMetricOption for raw series', () => {
  const option = build({ series: raw, kitPoints: [{ t: '2026-03-01T00:01:30.000Z', value: 99, source: 'test_kit' }] })

  it('draws every sensor reading without an envelope', () => {
    const sensor = named(option, SERIES_NAMES.sensor)!
    expect((sensor.data as Array<[number, number]>).map(([, v]) => v)).toEqual([25.1, 25.2, 25.3])
    expect(named(option, SERIES_NAMES.envelope)).toBeUndefined()
    expect(named(option, SERIES_NAMES.mean)).toBeUndefined()
    expect(sensor.markArea?.data).toEqual([[{ yAxis: 24 }, { yAxis: 27 }]])
  })

  it('takes test-kit readings from the raw series (not the overlay) so none is drawn twice', () => {
    expect(named(option, SERIES_NAMES.kit)!.data).toEqual([[Date.parse('2026-03-01T00:01:30.000Z'), 25.6]])
  })
})

describe('display units', () => {
  it('converts values and the band to °F (t/°C = (t/°F − 32)/1.8: NIST SP 811, Thompson & Taylor 2008, Appendix B, temperature conversion factors)', () => {
    const option = build({ convert: celsiusToFahrenheit, unitLabel: '°F' })
    const mean = named(option, SERIES_NAMES.mean)!.data as Array<[number, number]>
    expect(mean[0]![1]).toBeCloseTo(77, 9)
    expect(named(option, SERIES_NAMES.mean)!.markArea?.data).toEqual([[{ yAxis: 75.2 }, { yAxis: 80.6 }]])
  })
})

describe('withGaps', () => {
  it('breaks the line where readings stop for longer than three steps', () => {
    const minute = 60_000
    const out = withGaps(
      [
        [0, 1],
        [minute, 2],
        [10 * minute, 3],
      ],
      minute,
    )
    expect(out).toEqual([
      [0, 1],
      [minute, 2],
      [minute + 1, null],
      [10 * minute, 3],
    ])
  })
})

describe('y axis', () => {
  type MinFn = (extent: { min: number }) => number
  it('keeps the band in view and never goes below the floor', () => {
    const withBand = build({})
    expect((withBand.yAxis as { min: MinFn }).min({ min: 24.5 })).toBe(24)
    const light = build({ band: null, floor: 0 })
    expect((light.yAxis as { min: MinFn }).min({ min: -0.5 })).toBe(0)
    expect((light.yAxis as { min: MinFn }).min({ min: 12 })).toBe(12)
    expect((build({ band: null }).yAxis as { min?: MinFn }).min).toBeUndefined()
  })
})

describe('care events and incidents on the chart', () => {
  it('draws care events as marker lines and incidents as shaded spans inside the range', async () => {
    const { eventsSeries } = await import('@/components/charts/options')
    const from = Date.parse('2026-03-01T00:00:00Z')
    const to = Date.parse('2026-03-02T00:00:00Z')
    const series = eventsSeries(
      {
        events: [
          { t: '2026-03-01T10:00:00Z', label: 'Water change' },
          { t: '2026-02-20T10:00:00Z', label: 'Too early' },
        ],
        incidents: [
          { from: '2026-03-01T12:00:00Z', to: '2026-03-01T13:30:00Z', label: 'Water level at or below the heater top', severity: 'alarm' },
          { from: '2026-02-28T22:00:00Z', to: null, label: 'Still open', severity: 'warning' },
        ],
      },
      from,
      to,
      '#222',
    )!
    expect(series.markLine!.data).toEqual([{ xAxis: Date.parse('2026-03-01T10:00:00Z'), name: 'Water change' }])
    const areas = series.markArea!.data as Array<[{ xAxis: number; name: string }, { xAxis: number }]>
    expect(areas.map(([a, b]) => [a.name, a.xAxis, b.xAxis])).toEqual([
      ['Water level at or below the heater top', Date.parse('2026-03-01T12:00:00Z'), Date.parse('2026-03-01T13:30:00Z')],
      ['Still open', from, to],
    ])
    expect(eventsSeries({}, from, to, '#222')).toBeNull()
  })
})
