import type { LineSeriesOption, ScatterSeriesOption } from 'echarts/charts'
import type {
  DataZoomComponentOption,
  GridComponentOption,
  LegendComponentOption,
  MarkAreaComponentOption,
  MarkLineComponentOption,
  TooltipComponentOption,
} from 'echarts/components'
import type { ComposeOption } from 'echarts/core'
import type { SeriesBucket, SeriesResponse } from '@shared/schemas/series'
import { formatClock, formatDateTime, formatDay } from '@shared/time'

export type MetricChartOption = ComposeOption<
  | LineSeriesOption
  | ScatterSeriesOption
  | GridComponentOption
  | TooltipComponentOption
  | DataZoomComponentOption
  | MarkAreaComponentOption
  | MarkLineComponentOption
  | LegendComponentOption
>

/** Series names double as legend entries, so they are the words a keeper reads. */
export const SERIES_NAMES = {
  mean: 'Mean',
  envelopeBase: 'Lowest',
  envelope: 'Min–max range',
  sensor: 'Sensor',
  kit: 'Test kit',
  spike: 'Spike (rules ignore it)',
  events: 'Care and incidents',
} as const

export const STACK_ENVELOPE = 'envelope'

export interface TimedValue {
  t: string
  value: number
  source?: 'device' | 'test_kit' | 'import'
}

export interface ChartColors {
  line: string
  envelope: string
  band: string
  kit: string
  text: string
}

/** A care-log event drawn as a marker line (water change, livestock in, media changed…). */
export interface ChartEvent {
  t: string
  label: string
}

/** An incident drawn as a shaded span from when it opened until it was resolved (or now). */
export interface ChartIncident {
  from: string
  to: string | null
  label: string
  severity: 'warning' | 'alarm'
}

export interface MetricChartInput {
  series: SeriesResponse
  events?: ChartEvent[]
  incidents?: ChartIncident[]
  /** Test-kit readings (canonical) to draw over bucketed series; raw series carry their own. */
  kitPoints?: TimedValue[]
  /** Readings from the live socket (canonical); only those after the series' last point are drawn. */
  livePoints?: TimedValue[]
  band?: { min: number; max: number } | null
  /** Lowest value the metric can take, in display units (0 lux): the axis never goes below it. */
  floor?: number | null
  /** Canonical → display unit (°F for someone who prefers it). */
  convert?: (canonical: number) => number
  unitLabel: string
  precision: number
  timeZone?: string
  colors: ChartColors
}

type Pair = [number, number | null]

const ms = (iso: string) => Date.parse(iso)
const identity = (v: number) => v

/** A reading interval is a gap when it is this many times longer than usual; the line breaks there. */
const GAP_FACTOR = 3

function medianStep(times: number[]): number {
  const steps: number[] = []
  for (let i = 1; i < times.length; i++) steps.push(times[i]! - times[i - 1]!)
  if (!steps.length) return Infinity
  steps.sort((a, b) => a - b)
  return steps[Math.floor(steps.length / 2)]!
}

/** Adds a null between two points that are far apart, so ECharts does not bridge an outage. */
export function withGaps(points: Array<[number, number]>, expectedStepMs: number): Pair[] {
  const out: Pair[] = []
  for (let i = 0; i < points.length; i++) {
    const point = points[i]!
    const previous = points[i - 1]
    if (previous && point[0] - previous[0] > GAP_FACTOR * expectedStepMs) out.push([previous[0] + 1, null])
    out.push(point)
  }
  return out
}

function tickFormatter(spanMs: number, timeZone?: string) {
  return (value: number) => (spanMs <= 36 * 3_600_000 ? formatClock(value, timeZone) : formatDay(value, timeZone))
}

function bandArea(band: MetricChartInput['band'], convert: (v: number) => number, color: string): LineSeriesOption['markArea'] {
  if (!band) return undefined
  return {
    silent: true,
    itemStyle: { color, opacity: 0.18 },
    label: { show: true, position: 'insideTopLeft', formatter: 'Target band', fontSize: 11 },
    data: [[{ yAxis: convert(band.min) }, { yAxis: convert(band.max) }]],
  }
}

function liveAfter(live: TimedValue[] | undefined, lastMs: number, kit: boolean): Array<[number, number]> {
  return (live ?? []).filter((p) => ms(p.t) > lastMs && (p.source === 'test_kit') === kit).map((p) => [ms(p.t), p.value] as [number, number])
}

function kitScatter(points: Array<[number, number]>, color: string): ScatterSeriesOption {
  return {
    name: SERIES_NAMES.kit,
    type: 'scatter',
    symbol: 'diamond',
    symbolSize: 11,
    itemStyle: { color, borderColor: '#ffffff', borderWidth: 1 },
    z: 5,
    data: points,
  }
}

/** A probe's spikes: ringed on the line, since the watch rules do not act on them alone. */
function spikeScatter(points: Array<[number, number]>, color: string): ScatterSeriesOption {
  return {
    name: SERIES_NAMES.spike,
    type: 'scatter',
    symbol: 'circle',
    symbolSize: 14,
    itemStyle: { color: 'transparent', borderColor: color, borderWidth: 2 },
    z: 6,
    data: points,
  }
}

function envelopeSeries(buckets: SeriesBucket[], step: number, convert: (v: number) => number, colors: ChartColors): LineSeriesOption[] {
  const base = withGaps(
    buckets.map((b) => [ms(b.t), convert(b.min)]),
    step,
  )
  const spread = withGaps(
    buckets.map((b) => [ms(b.t), convert(b.max) - convert(b.min)]),
    step,
  )
  const common = { type: 'line' as const, stack: STACK_ENVELOPE, symbol: 'none', connectNulls: false, silent: true }
  return [
    { ...common, name: SERIES_NAMES.envelopeBase, lineStyle: { opacity: 0 }, data: base },
    {
      ...common,
      name: SERIES_NAMES.envelope,
      lineStyle: { opacity: 0 },
      itemStyle: { color: colors.envelope },
      areaStyle: { color: colors.envelope, opacity: 0.3 },
      data: spread,
    },
  ]
}

function yAxisMin(band: { min: number } | null, floor: number | null) {
  if (!band && floor == null) return undefined
  return (extent: { min: number }) => {
    const low = band ? Math.min(extent.min, band.min) : extent.min
    return floor != null ? Math.max(floor, low) : low
  }
}

interface TooltipItem {
  seriesName?: string
  marker?: unknown
  value?: unknown
}

/** One line per series; the envelope reads as "min – max" instead of the stacked difference. */
function tooltipFormatter(series: SeriesResponse, convert: (v: number) => number, format: (v: number) => string, timeZone?: string) {
  const buckets = new Map(series.points.map((b) => [ms(b.t), b]))
  return (params: unknown): string => {
    const items = (Array.isArray(params) ? params : [params]) as TooltipItem[]
    const lines: string[] = []
    let time: number | null = null
    for (const item of items) {
      const [t, v] = Array.isArray(item.value) ? (item.value as [number, number | null]) : [NaN, null]
      if (v == null || item.seriesName === SERIES_NAMES.envelopeBase) continue
      time ??= t
      const marker = typeof item.marker === 'string' ? item.marker : ''
      if (item.seriesName === SERIES_NAMES.envelope) {
        const bucket = buckets.get(t)
        if (bucket) lines.push(`${marker}${SERIES_NAMES.envelope}: ${format(convert(bucket.min))} – ${format(convert(bucket.max))}`)
      } else {
        lines.push(`${marker}${item.seriesName ?? ''}: ${format(v)}`)
      }
    }
    if (time == null) return ''
    return [formatDateTime(time, timeZone), ...lines].join('<br/>')
  }
}

export function buildMetricOption(input: MetricChartInput): MetricChartOption {
  const convert = input.convert ?? identity
  const { series, colors } = input
  const bucketed = series.bucketSeconds > 0
  const fromMs = ms(series.from)
  // Live readings arriving after the fetch stretch the axis rather than fall off its end.
  const toMs = Math.max(ms(series.to), ...(input.livePoints ?? []).map((p) => ms(p.t)))
  const seriesList: Array<LineSeriesOption | ScatterSeriesOption> = []
  let kit: Array<[number, number]>
  let main: LineSeriesOption
  // Drawn under the mean, but listed after it: the zoom slider previews the first line series of its axis.
  let envelope: LineSeriesOption[] = []

  if (bucketed) {
    const step = series.bucketSeconds * 1000
    const lastMs = series.points.length ? ms(series.points[series.points.length - 1]!.t) : fromMs
    const mean: Array<[number, number]> = series.points.map((b) => [ms(b.t), convert(b.mean)])
    const live = liveAfter(input.livePoints, lastMs, false).map(([t, v]) => [t, convert(v)] as [number, number])
    envelope = envelopeSeries(series.points, step, convert, colors)
    main = {
      name: SERIES_NAMES.mean,
      type: 'line',
      symbol: 'none',
      connectNulls: false,
      lineStyle: { width: 2, color: colors.line },
      itemStyle: { color: colors.line },
      data: withGaps([...mean, ...live], step),
    }
    kit = (input.kitPoints ?? []).filter((p) => ms(p.t) >= fromMs).map((p) => [ms(p.t), convert(p.value)])
  } else {
    const sensorRaw = series.raw.filter((r) => r.source !== 'test_kit')
    const lastMs = series.raw.length ? ms(series.raw[series.raw.length - 1]!.t) : fromMs
    const sensor: Array<[number, number]> = [
      ...sensorRaw.map((r) => [ms(r.t), r.value] as [number, number]),
      ...liveAfter(input.livePoints, lastMs, false),
    ].map(([t, v]) => [t, convert(v)])
    const step = medianStep(sensor.map((p) => p[0]))
    main = {
      name: SERIES_NAMES.sensor,
      type: 'line',
      showSymbol: sensor.length <= 150,
      symbol: 'circle',
      symbolSize: 4,
      connectNulls: false,
      lineStyle: { width: 2, color: colors.line },
      itemStyle: { color: colors.line },
      data: Number.isFinite(step) ? withGaps(sensor, step) : sensor,
    }
    kit = [
      ...series.raw.filter((r) => r.source === 'test_kit').map((r) => [ms(r.t), r.value] as [number, number]),
      ...liveAfter(input.livePoints, lastMs, true),
    ].map(([t, v]) => [t, convert(v)])
  }
  main.markArea = bandArea(input.band, convert, colors.band)
  main.z = 3
  seriesList.push(main, ...envelope)
  if (kit.length) seriesList.push(kitScatter(kit, colors.kit))
  const spikes = bucketed ? [] : series.raw.filter((r) => r.spike).map((r) => [ms(r.t), convert(r.value)] as [number, number])
  if (spikes.length) seriesList.push(spikeScatter(spikes, colors.text))
  const marks = eventsSeries(input, fromMs, toMs, colors.text)
  if (marks) seriesList.push(marks)

  const legend: string[] = bucketed ? [SERIES_NAMES.mean, SERIES_NAMES.envelope] : [SERIES_NAMES.sensor]
  if (kit.length) legend.push(SERIES_NAMES.kit)
  if (spikes.length) legend.push(SERIES_NAMES.spike)
  const band = input.band ? { min: convert(input.band.min), max: convert(input.band.max) } : null
  const format = (v: number) => `${v.toFixed(input.precision)} ${input.unitLabel}`.trim()

  return {
    animation: false,
    textStyle: { color: colors.text },
    // Room on the right for the last time label, which ECharts centres on the axis's end.
    grid: { left: 8, right: 32, top: 36, bottom: 64, containLabel: true },
    legend: { data: legend, top: 0, textStyle: { color: colors.text } },
    tooltip: {
      trigger: 'axis',
      axisPointer: { type: 'line', label: { formatter: (p: { value: unknown }) => formatDateTime(Number(p.value), input.timeZone) } },
      formatter: tooltipFormatter(series, convert, format, input.timeZone),
    },
    xAxis: {
      type: 'time',
      min: fromMs,
      max: toMs,
      axisLabel: { formatter: tickFormatter(toMs - fromMs, input.timeZone), hideOverlap: true, color: colors.text },
    },
    yAxis: {
      type: 'value',
      scale: true,
      name: input.unitLabel,
      nameTextStyle: { color: colors.text },
      axisLabel: { color: colors.text },
      // The band stays in view even when every reading sits far from it.
      min: yAxisMin(band, input.floor ?? null),
      max: band ? (extent: { max: number }) => Math.max(extent.max, band.max) : undefined,
    },
    dataZoom: [
      { type: 'inside', xAxisIndex: 0, filterMode: 'none' },
      { type: 'slider', xAxisIndex: 0, filterMode: 'none', height: 22, bottom: 8, left: 48, right: 48, showDataShadow: true },
    ],
    series: seriesList,
  }
}

const SPAN_COLORS = { warning: 'rgba(183, 121, 31, 0.16)', alarm: 'rgba(179, 38, 30, 0.16)' } as const

/** Care events as dashed marker lines and incidents as shaded spans, on a series of their own. */
export function eventsSeries(input: Pick<MetricChartInput, 'events' | 'incidents'>, fromMs: number, toMs: number, textColor: string): LineSeriesOption | null {
  const events = (input.events ?? []).filter((e) => ms(e.t) >= fromMs && ms(e.t) <= toMs)
  const spans = (input.incidents ?? []).filter((i) => ms(i.from) <= toMs && (i.to === null || ms(i.to) >= fromMs))
  if (!events.length && !spans.length) return null
  return {
    name: SERIES_NAMES.events,
    type: 'line',
    data: [],
    silent: true,
    markLine: {
      symbol: ['none', 'none'],
      label: { formatter: '{b}', position: 'insideEndTop', color: textColor, fontSize: 11 },
      lineStyle: { type: 'dashed', color: textColor, opacity: 0.6 },
      data: events.map((e) => ({ xAxis: ms(e.t), name: e.label })),
    },
    markArea: {
      label: { color: textColor, fontSize: 11, position: 'insideTopLeft' },
      data: spans.map((i) => [
        { xAxis: Math.max(ms(i.from), fromMs), name: i.label, itemStyle: { color: SPAN_COLORS[i.severity] } },
        { xAxis: i.to ? Math.min(ms(i.to), toMs) : toMs },
      ]),
    },
  }
}
