/** The drawing box of a trend line; the SVG stretches it to the tile (preserveAspectRatio none). */
export const SPARK_WIDTH = 100
export const SPARK_HEIGHT = 40
/** Room above and below the line, as a share of the box, so a flat line does not sit on the edge. */
const PAD = 0.1

export interface SparkPaths {
  line: string
  area: string
}

const fixed = (v: number) => Number(v.toFixed(2))

/**
 * A trend line and the area under it as SVG path data, time along x and value along y, each scaled
 * to its own extent (a steady tank shows its small wobble). Null for fewer than two points.
 */
export function sparkPaths(points: ReadonlyArray<readonly [number, number]>): SparkPaths | null {
  if (points.length < 2) return null
  let t0 = Infinity
  let t1 = -Infinity
  let lo = Infinity
  let hi = -Infinity
  for (const [t, v] of points) {
    t0 = Math.min(t0, t)
    t1 = Math.max(t1, t)
    lo = Math.min(lo, v)
    hi = Math.max(hi, v)
  }
  const span = t1 - t0 || 1
  const x = (t: number) => fixed(((t - t0) / span) * SPARK_WIDTH)
  const inner = SPARK_HEIGHT * (1 - 2 * PAD)
  const y = (v: number) => fixed(hi === lo ? SPARK_HEIGHT / 2 : SPARK_HEIGHT * PAD + ((hi - v) / (hi - lo)) * inner)
  const line = points.map(([t, v], i) => `${i ? 'L' : 'M'}${x(t)} ${y(v)}`).join('')
  const first = points[0]!
  const last = points[points.length - 1]!
  return { line, area: `${line}L${x(last[0])} ${SPARK_HEIGHT}L${x(first[0])} ${SPARK_HEIGHT}Z` }
}
