// How report figures read, the same in the app, the PDF and the mail.
import type { ReportMetric } from '../schemas/reports'

/** "3 h 05 min", "12 min", "2 d 4 h". */
export function formatSpan(ms: number | null): string {
  if (ms === null) return '–'
  const minutes = Math.max(0, Math.round(ms / 60_000))
  const days = Math.floor(minutes / 1440)
  const hours = Math.floor((minutes % 1440) / 60)
  const mins = minutes % 60
  if (days) return `${days} d ${hours} h`
  if (hours) return `${hours} h ${String(mins).padStart(2, '0')} min`
  return `${mins} min`
}

export const formatPercent = (value: number | null) => (value === null ? '–' : `${value.toFixed(1)} %`)

const PRECISION: Record<ReportMetric['metric'], number> = { temperature: 1, ph: 2 }

/** A value of the metric with its unit: "25.4 °C", "pH 7.12". */
export function formatValue(metric: Pick<ReportMetric, 'metric' | 'unitLabel'>, value: number | null): string {
  if (value === null) return '–'
  const digits = value.toFixed(PRECISION[metric.metric])
  return metric.metric === 'ph' ? `pH ${digits}` : `${digits} ${metric.unitLabel}`
}

/** "24.0–28.0 °C", "≥ 24.0 °C", "≤ pH 8.00", or "no target band". */
export function formatBand(metric: Pick<ReportMetric, 'metric' | 'unitLabel' | 'band'>): string {
  const band = metric.band
  if (!band || (band.min === null && band.max === null)) return 'no target band'
  if (band.min !== null && band.max !== null) {
    const [lo, hi] = [formatValue(metric, band.min), formatValue(metric, band.max)]
    return metric.metric === 'ph' ? `pH ${band.min.toFixed(2)}–${band.max.toFixed(2)}` : `${lo.split(' ')[0]}–${hi}`
  }
  return band.min !== null ? `≥ ${formatValue(metric, band.min)}` : `≤ ${formatValue(metric, band.max)}`
}

/** One line: time in band, min, max, mean, coverage and gaps. */
export function metricSummary(m: ReportMetric): string {
  const gapTime = m.gaps.reduce((a, g) => a + g.durationMs, 0)
  const gaps = m.gaps.length ? `${m.gaps.length} gap${m.gaps.length === 1 ? '' : 's'} (${formatSpan(gapTime)})` : 'no gaps'
  return [
    `in band ${formatPercent(m.timeInBandPercent)}`,
    `min ${formatValue(m, m.min)}`,
    `max ${formatValue(m, m.max)}`,
    `mean ${formatValue(m, m.mean)}`,
    `coverage ${formatPercent(m.coveragePercent)}`,
    gaps,
  ].join(' · ')
}
