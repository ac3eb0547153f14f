import type { ClockStyle } from '@shared/schemas/auth'
import { formatClock, formatDateTime } from '@shared/time'
import { offsetAt } from '@shared/time/zoned'

// The chart library and the image library are loaded on the first chart, not at start-up: together
// they are about 60 MB of memory an instance that never mails a chart never needs.
const libraries = () => Promise.all([import('echarts'), import('sharp')])

export type TrendChartInput = {
  points: Array<[number, number]>
  band?: { min: number; max: number }
  title: string
  unitLabel: string
  timeZone: string
  /** The organisation's clock for the axis labels; 24-hour unless given. */
  clockStyle?: ClockStyle
  /** The span the axis shows (the mail's "last 6 h"); by default the points' own span. */
  window?: { from: number; to: number }
  width?: number
  height?: number
}

export const TREND_CHART_SIZE = { width: 600, height: 240 }

/** Axis labels in the site's zone: the chart library itself only knows the process's zone. */
function clockLabel(timeZone: string, spanMs: number, style?: ClockStyle) {
  const format = spanMs > 36 * 3_600_000 ? formatDateTime : formatClock
  return (ms: number) => format(ms, timeZone, style)
}

const MINUTE = 60_000
const TIME_STEPS = [1, 2, 5, 10, 15, 30, 60, 120, 180, 360, 720, 1440, 2880, 10080].map((m) => m * MINUTE)

/**
 * Time-axis ticks on whole local minutes, hours or days, about five of them and at least a
 * minute apart: left to itself the chart library ticks a few seconds of data every few seconds,
 * and every label then reads the same "01:11".
 */
export function timeTicks(from: number, to: number, timeZone: string): { min: number; max: number; step: number } {
  const span = Math.max(to - from, 5 * MINUTE)
  const step = TIME_STEPS.find((s) => s >= span / 6) ?? TIME_STEPS.at(-1)!
  const offset = offsetAt(timeZone, from)
  const min = Math.floor((from + offset) / step) * step - offset
  const max = Math.ceil((Math.max(to, from + 5 * MINUTE) + offset) / step) * step - offset
  return { min, max, step }
}

/** 1, 2 or 5 times a power of ten: axis limits on such multiples read as round numbers. */
function niceStep(rough: number): number {
  const power = 10 ** Math.floor(Math.log10(rough))
  return [1, 2, 5, 10].map((f) => f * power).find((step) => step >= rough) ?? 10 * power
}

/** Axis limits that hold every value and the band, with a little room, on round numbers. */
function valueRange(all: number[]): { min?: number; max?: number } {
  if (!all.length) return {}
  const lo = Math.min(...all)
  const hi = Math.max(...all)
  const step = niceStep(Math.max(hi - lo, Math.abs(hi) * 0.01, 1e-6) / 5)
  // Rounded to the step's decimals: 499 × 0.05 is 24.950000000000003, which the chart library rejects.
  const decimals = Math.max(0, -Math.floor(Math.log10(step)))
  const round = (v: number) => Number(v.toFixed(decimals))
  return { min: round(Math.floor((lo - step / 2) / step) * step), max: round(Math.ceil((hi + step / 2) / step) * step) }
}

/** Renders the chart as SVG on the server (no canvas, no browser). */
export async function renderTrendSvg(input: TrendChartInput): Promise<string> {
  const [echarts] = await libraries()
  const width = input.width ?? TREND_CHART_SIZE.width
  const height = input.height ?? TREND_CHART_SIZE.height
  const times = input.points.map(([t]) => t)
  const from = input.window?.from ?? (times.length ? Math.min(...times) : Date.now())
  const to = input.window?.to ?? (times.length ? Math.max(...times) : from)
  const ticks = timeTicks(from, to, input.timeZone)
  const spanMs = ticks.max - ticks.min
  const values = input.points.map(([, v]) => v)
  const limits = input.band ? [input.band.min, input.band.max] : []
  const range = valueRange([...values, ...limits])
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height })
  try {
    chart.setOption({
      animation: false,
      backgroundColor: '#ffffff',
      textStyle: { fontFamily: 'DejaVu Sans, Arial, sans-serif' },
      title: {
        text: input.unitLabel && !input.title.includes(input.unitLabel) ? `${input.title} (${input.unitLabel})` : input.title,
        left: 8,
        top: 6,
        textStyle: { fontSize: 13, fontWeight: 'bold', color: '#1f2933' },
      },
      grid: { left: 52, right: 16, top: 36, bottom: 28 },
      xAxis: {
        type: 'time',
        min: ticks.min,
        max: ticks.max,
        minInterval: ticks.step,
        maxInterval: ticks.step,
        axisLabel: { formatter: clockLabel(input.timeZone, spanMs, input.clockStyle), color: '#52606d', fontSize: 10, hideOverlap: true },
      },
      yAxis: {
        type: 'value',
        ...range,
        axisLabel: { color: '#52606d', fontSize: 10 },
        splitLine: { lineStyle: { color: '#e4e7eb' } },
      },
      series: [
        {
          type: 'line',
          data: input.points,
          showSymbol: false,
          lineStyle: { width: 2, color: '#0b6e99' },
          markArea: input.band
            ? { silent: true, itemStyle: { color: 'rgba(56, 161, 105, 0.15)' }, data: [[{ yAxis: input.band.min }, { yAxis: input.band.max }]] }
            : undefined,
        },
      ],
    })
    return chart.renderToSVGString()
  } finally {
    chart.dispose()
  }
}

/** A PNG of the recent trend for an alert mail (mail clients do not show SVG reliably). */
export async function renderTrendPng(input: TrendChartInput): Promise<Buffer> {
  const [, { default: sharp }] = await libraries()
  return sharp(Buffer.from(await renderTrendSvg(input)))
    .png()
    .toBuffer()
}
