// A few hundred points to draw a period's readings: bucket means, broken where the data has gaps.
import type { Gap, TimedValue } from './stability'

export const CHART_POINTS = 240

/**
 * One point per bucket at its middle: the mean of the readings in it; an empty bucket carries the
 * value before it, unless its middle lies in a gap, where the point is null so the line breaks.
 */
export function chartSeries(
  readings: readonly TimedValue[],
  from: number,
  to: number,
  gaps: readonly Gap[],
  points = CHART_POINTS,
): Array<[number, number | null]> {
  const width = (to - from) / points
  const sums = new Array<number>(points).fill(0)
  const counts = new Array<number>(points).fill(0)
  for (const r of readings) {
    if (r.at < from || r.at >= to) continue
    const i = Math.min(points - 1, Math.floor((r.at - from) / width))
    sums[i]! += r.value
    counts[i]!++
  }
  const before = [...readings]
    .filter((r) => r.at < from)
    .sort((a, b) => a.at - b.at)
    .at(-1)
  let carried: number | null = before?.value ?? null
  const inGap = (t: number) => gaps.some((g) => t >= g.from && t < g.to)
  const out: Array<[number, number | null]> = []
  for (let i = 0; i < points; i++) {
    const middle = Math.round(from + (i + 0.5) * width)
    if (counts[i]) {
      const mean = sums[i]! / counts[i]!
      out.push([middle, mean])
      carried = mean
    } else out.push([middle, inGap(middle) ? null : carried])
  }
  return out
}
