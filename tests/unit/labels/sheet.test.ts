import { describe, expect, it } from 'vitest'
import { labelGrid, placeLabels } from '@shared/labels/sheet'

// Paper: ISO 216 (A4 210 × 297 mm) and ANSI/ASME Y14.1 (US letter 215.9 × 279.4 mm). Label cells
// 70 × 37 mm three across and 99 × 67 mm two across are the usual adhesive sheets (common practice).
describe('label sheets', () => {
  it('fits 24 small labels on A4, edge to edge across and 0.5 mm left at top and bottom', () => {
    const grid = labelGrid('a4', 'small')
    expect([grid.across, grid.down, grid.perPage]).toEqual([3, 8, 24])
    expect(grid.cells[0]).toEqual({ x: 0, y: 0.5, width: 70, height: 37 })
    expect(grid.cells[23]).toMatchObject({ x: 140, y: 0.5 + 7 * 37 })
  })

  it('fits 21 small labels on US letter, centred', () => {
    const grid = labelGrid('letter', 'small')
    expect([grid.across, grid.down]).toEqual([3, 7])
    expect(grid.cells[0]!.x).toBeCloseTo(2.95, 5)
    expect(grid.cells[0]!.y).toBeCloseTo((279.4 - 259) / 2, 5)
  })

  it('fits 8 large labels on A4 and on US letter, two across', () => {
    expect(labelGrid('a4', 'large')).toMatchObject({ across: 2, down: 4, perPage: 8 })
    expect(labelGrid('letter', 'large')).toMatchObject({ across: 2, down: 4, perPage: 8 })
  })

  it('keeps every cell on the paper', () => {
    for (const [paper, w, h] of [
      ['a4', 210, 297],
      ['letter', 215.9, 279.4],
    ] as const) {
      for (const size of ['small', 'large'] as const) {
        for (const c of labelGrid(paper, size).cells) {
          expect(c.x).toBeGreaterThanOrEqual(0)
          expect(c.y).toBeGreaterThanOrEqual(0)
          expect(c.x + c.width).toBeLessThanOrEqual(w + 1e-9)
          expect(c.y + c.height).toBeLessThanOrEqual(h + 1e-9)
        }
      }
    }
  })

  it('starts a new page after the last cell', () => {
    const grid = labelGrid('a4', 'large')
    const placed = placeLabels(
      Array.from({ length: 9 }, (_, i) => i),
      grid,
    )
    expect(placed.map((p) => p.page)).toEqual([0, 0, 0, 0, 0, 0, 0, 0, 1])
    expect(placed[8]!.cell).toEqual(grid.cells[0])
  })
})
