// A chart's text alternative: one sentence for its accessible description, and its points as the
// rows of a table. Built from the same data the chart draws, in display units.
import { formatZonedDateTime } from '@shared/time'
import { SERIES_NAMES, type MetricChartInput } from './options'

export interface ChartRow {
  t: number
  /** One value per column; null where that column has no value at this time. */
  values: Array<number | null>
  /** Where the row's values come from when the chart mixes sources ("Test kit"). */
  source?: string
}

export interface ChartText {
  /** What the chart shows: "Temperature". */
  subject: string
  /** The time span shown on the axis. */
  from: number
  to: number
  timeZone?: string
  /** Headings of the value columns: ["Mean", "Lowest", "Highest"], or ["Reading"]. */
  columns: string[]
  rows: ChartRow[]
  format: (value: number) => string
}

const present = (values: Array<number | null>) => values.filter((v): v is number => v != null)

/**
 * "Latest 25.5 °C at 5 Dec, 14:02 CET. Shown: 25.1 °C to 25.9 °C, from 4 Dec, 14:02 CET to 5 Dec,
 * 14:02 CET." The latest is the last row's first value; the range spans every value of every column.
 */
export function describeChart(text: ChartText): string {
  const span = `from ${formatZonedDateTime(text.from, text.timeZone)} to ${formatZonedDateTime(text.to, text.timeZone)}`
  const all = text.rows.flatMap((r) => present(r.values))
  if (!all.length) return `${text.subject}: no readings ${span}.`
  const latest = [...text.rows].reverse().find((r) => present(r.values).length)!
  const latestValue = present(latest.values)[0]!
  const low = Math.min(...all)
  const high = Math.max(...all)
  const shown = low === high ? `every value ${text.format(low)}` : `${text.format(low)} to ${text.format(high)}`
  return `${text.subject}: latest ${text.format(latestValue)} at ${formatZonedDateTime(latest.t, text.timeZone)}. Shown ${shown}, ${span}.`
}

const ms = (iso: string) => Date.parse(iso)

/**
 * The rows of a tank-page chart: per bucket its mean as the value with its lowest and highest, or each
 * reading; test-kit readings are rows of their own, with their source.
 */
export function metricChartRows(
  input: Pick<MetricChartInput, 'series' | 'kitPoints' | 'livePoints' | 'convert'>,
): Pick<ChartText, 'columns' | 'rows' | 'from' | 'to'> {
  const convert = input.convert ?? ((v: number) => v)
  const { series } = input
  const live = input.livePoints ?? []
  const from = ms(series.from)
  const to = Math.max(ms(series.to), ...live.map((p) => ms(p.t)))
  const kitRows = (points: Array<{ t: string; value: number }>, width: number): ChartRow[] =>
    points.map((p) => ({ t: ms(p.t), values: [convert(p.value), ...new Array<null>(width - 1).fill(null)], source: SERIES_NAMES.kit }))

  if (series.bucketSeconds > 0) {
    const last = series.points.length ? ms(series.points[series.points.length - 1]!.t) : from
    const rows: ChartRow[] = [
      ...series.points.map((b) => ({ t: ms(b.t), values: [convert(b.mean), convert(b.min), convert(b.max)], source: SERIES_NAMES.sensor })),
      ...live
        .filter((p) => ms(p.t) > last && p.source !== 'test_kit')
        .map((p) => ({ t: ms(p.t), values: [convert(p.value), null, null], source: SERIES_NAMES.sensor })),
      ...kitRows(
        (input.kitPoints ?? []).filter((p) => ms(p.t) >= from),
        3,
      ),
    ]
    return { from, to, columns: ['Value', 'Lowest', 'Highest'], rows: rows.sort((a, b) => a.t - b.t) }
  }
  const last = series.raw.length ? ms(series.raw[series.raw.length - 1]!.t) : from
  const readings = [...series.raw, ...live.filter((p) => ms(p.t) > last)]
  const rows = readings.map((r) => ({
    t: ms(r.t),
    values: [convert(r.value)],
    source: r.source === 'test_kit' ? SERIES_NAMES.kit : r.source === 'import' ? 'Import' : SERIES_NAMES.sensor,
  }))
  return { from, to, columns: ['Reading'], rows: rows.sort((a, b) => a.t - b.t) }
}
