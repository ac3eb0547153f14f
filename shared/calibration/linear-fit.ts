/** Least-squares line y = intercept + slope·x through two or more points (exact through two). */
export function fitLine(points: ReadonlyArray<{ x: number; y: number }>): { intercept: number; slope: number } {
  const n = points.length
  const meanX = points.reduce((s, p) => s + p.x, 0) / n
  const meanY = points.reduce((s, p) => s + p.y, 0) / n
  let sxx = 0
  let sxy = 0
  for (const p of points) {
    sxx += (p.x - meanX) ** 2
    sxy += (p.x - meanX) * (p.y - meanY)
  }
  if (sxx === 0) throw new RangeError('the points need at least two different x values')
  const slope = sxy / sxx
  return { intercept: meanY - slope * meanX, slope }
}
