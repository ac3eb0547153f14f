// How steady one metric was over a period: time-weighted, with gaps reported instead of bridged.

/** One stored reading; `at` in epoch milliseconds. */
export type TimedValue = { at: number; value: number }

/** A target band; a missing side is open (no lower or no upper limit). */
export type StabilityBand = { min?: number | null; max?: number | null }

export type StabilityInput = {
  /**
   * Readings in any order. The last one before `from` may hold into the period and the first one
   * at or after `to` ends the period's last step; others outside [from, to) are ignored.
   */
  readings: readonly TimedValue[]
  from: number
  to: number
  band: StabilityBand | null
  /** A stated upper bound for the gap limit (ms); the limit is otherwise 3 × the usual interval. */
  maxGapMs?: number | null
}

export type Gap = { from: number; to: number; durationMs: number }

export type Stability = {
  /** Readings taken inside [from, to). */
  readings: number
  periodMs: number
  coveredMs: number
  /** Share of the period that readings cover, 0–100. */
  coveragePercent: number
  /** Steps longer than this are gaps (ms); null when there were too few readings to tell. */
  gapLimitMs: number | null
  /** Share of covered time inside the band, 0–100; null without a band or without covered time. */
  timeInBandPercent: number | null
  inBandMs: number | null
  belowMs: number | null
  aboveMs: number | null
  min: number | null
  max: number | null
  /** Time-weighted over covered time. */
  mean: number | null
  gaps: Gap[]
}

/** A step is a gap when it is longer than this many usual intervals. */
export const GAP_FACTOR = 3

function median(values: number[]): number | null {
  if (!values.length) return null
  const sorted = [...values].sort((a, b) => a - b)
  const mid = Math.floor(sorted.length / 2)
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2
}

/** 3 × the median positive step between readings, capped by a stated maximum. */
export function gapLimit(sortedTimes: readonly number[], maxGapMs?: number | null): number | null {
  const steps: number[] = []
  for (let i = 1; i < sortedTimes.length; i++) {
    const step = sortedTimes[i]! - sortedTimes[i - 1]!
    if (step > 0) steps.push(step)
  }
  const usual = median(steps)
  const stated = maxGapMs != null && maxGapMs > 0 ? maxGapMs : null
  if (usual === null) return stated
  return stated === null ? usual * GAP_FACTOR : Math.min(usual * GAP_FACTOR, stated)
}

function inBand(value: number, band: StabilityBand): -1 | 0 | 1 {
  if (band.min != null && value < band.min) return -1
  if (band.max != null && value > band.max) return 1
  return 0
}

/**
 * Each reading holds its value until the next one. When the next one is further away than the
 * gap limit (or there is none within the limit before the period ends), nothing is assumed about
 * the time in between: it is a gap, excluded from every figure and listed.
 */
export function stability(input: StabilityInput): Stability {
  const { from, to, band } = input
  if (!(to > from)) throw new RangeError('to must be after from')
  const sorted = [...input.readings].filter((r) => Number.isFinite(r.at) && Number.isFinite(r.value)).sort((a, b) => a.at - b.at)
  const prior = sorted.filter((r) => r.at < from).at(-1)
  const inside = sorted.filter((r) => r.at >= from && r.at < to)
  const after = sorted.find((r) => r.at >= to)
  const points = prior ? [prior, ...inside] : inside
  const limit = gapLimit(
    [...points, ...(after ? [after] : [])].map((r) => r.at),
    input.maxGapMs,
  )

  const gaps: Gap[] = []
  const addGap = (start: number, end: number) => {
    if (end <= start) return
    const last = gaps.at(-1)
    if (last && last.to >= start) {
      last.to = Math.max(last.to, end)
      last.durationMs = last.to - last.from
    } else gaps.push({ from: start, to: end, durationMs: end - start })
  }

  let coveredMs = 0
  let weighted = 0
  let inBandMs = 0
  let belowMs = 0
  let aboveMs = 0
  let min: number | null = null
  let max: number | null = null
  const note = (value: number) => {
    min = min === null ? value : Math.min(min, value)
    max = max === null ? value : Math.max(max, value)
  }
  for (const r of inside) note(r.value)

  const first = points[0]
  addGap(from, first ? Math.min(Math.max(first.at, from), to) : to)
  points.forEach((point, i) => {
    const successor = points[i + 1] ?? after
    const start = Math.max(point.at, from)
    const end = Math.min(successor ? successor.at : to, to)
    if (end <= start) return
    // Without a successor the step is measured to the end of the period.
    const step = (successor ? successor.at : to) - point.at
    if (limit === null || step > limit) return addGap(start, end)
    const held = end - start
    coveredMs += held
    weighted += point.value * held
    if (point === prior) note(point.value)
    if (band) {
      const side = inBand(point.value, band)
      if (side === 0) inBandMs += held
      else if (side < 0) belowMs += held
      else aboveMs += held
    }
  })

  const periodMs = to - from
  const hasBand = band !== null && coveredMs > 0
  return {
    readings: inside.length,
    periodMs,
    coveredMs,
    coveragePercent: (coveredMs / periodMs) * 100,
    gapLimitMs: limit,
    timeInBandPercent: hasBand ? (inBandMs / coveredMs) * 100 : null,
    inBandMs: band ? inBandMs : null,
    belowMs: band ? belowMs : null,
    aboveMs: band ? aboveMs : null,
    min,
    max,
    mean: coveredMs > 0 ? weighted / coveredMs : null,
    gaps,
  }
}
