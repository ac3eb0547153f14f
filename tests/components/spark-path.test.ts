import { describe, expect, it } from 'vitest'
import { SPARK_HEIGHT, SPARK_WIDTH, sparkPaths } from '@/components/wall/spark-path'

const HOUR = 3_600_000

describe('a tile trend line as SVG paths', () => {
  it('runs from the first reading at the left to the last at the right, highest value at the top', () => {
    const paths = sparkPaths([
      [0, 25],
      [HOUR, 26],
      [2 * HOUR, 24],
    ])!
    // 10 % of the box is left free above and below: 4 and 36 in a 40-high box.
    expect(paths.line).toBe('M0 20L50 4L100 36')
    expect(paths.area).toBe(`M0 20L50 4L100 36L100 ${SPARK_HEIGHT}L0 ${SPARK_HEIGHT}Z`)
  })

  it('draws a steady tank as a flat line across the middle', () => {
    expect(
      sparkPaths([
        [0, 25.5],
        [HOUR, 25.5],
      ])!.line,
    ).toBe(`M0 ${SPARK_HEIGHT / 2}L${SPARK_WIDTH} ${SPARK_HEIGHT / 2}`)
  })

  it('draws nothing for fewer than two readings', () => {
    expect(sparkPaths([])).toBeNull()
    expect(sparkPaths([[0, 25]])).toBeNull()
  })
})
