/**
 * Where each label sits on a printed sheet. Sizes in millimetres; PDF points are 1/72 inch.
 * Paper sizes: A4 210 × 297 mm (ISO 216); US letter 8.5 × 11 in, 215.9 × 279.4 mm (ANSI/ASME Y14.1).
 * The label sizes are the common adhesive sheets' cells (`common practice`): 70 × 37 mm, three
 * across; 99 × 67 mm, two across.
 */
export const LABEL_PAPERS = ['a4', 'letter'] as const
export type LabelPaper = (typeof LABEL_PAPERS)[number]
export const LABEL_SIZES = ['small', 'large'] as const
export type LabelSize = (typeof LABEL_SIZES)[number]

export const PAPER_MM: Record<LabelPaper, { width: number; height: number }> = {
  a4: { width: 210, height: 297 },
  letter: { width: 215.9, height: 279.4 },
}
export const LABEL_MM: Record<LabelSize, { width: number; height: number; across: number }> = {
  small: { width: 70, height: 37, across: 3 },
  large: { width: 99, height: 67, across: 2 },
}

export const MM_TO_PT = 72 / 25.4

export type LabelCell = { x: number; y: number; width: number; height: number }
export type LabelGrid = { across: number; down: number; perPage: number; cells: LabelCell[] }

/** The cells of one page, in millimetres from the top left, the block of labels centred on the paper. */
export function labelGrid(paper: LabelPaper, size: LabelSize): LabelGrid {
  const page = PAPER_MM[paper]
  const label = LABEL_MM[size]
  const across = Math.min(label.across, Math.floor(page.width / label.width))
  const down = Math.floor(page.height / label.height)
  const left = (page.width - across * label.width) / 2
  const top = (page.height - down * label.height) / 2
  const cells: LabelCell[] = []
  for (let row = 0; row < down; row++) {
    for (let col = 0; col < across; col++) cells.push({ x: left + col * label.width, y: top + row * label.height, width: label.width, height: label.height })
  }
  return { across, down, perPage: cells.length, cells }
}

/** The page a tank's label goes on and its cell there, for the tanks in print order. */
export function placeLabels<T>(items: T[], grid: LabelGrid): Array<{ page: number; cell: LabelCell; item: T }> {
  return items.map((item, i) => ({ page: Math.floor(i / grid.perPage), cell: grid.cells[i % grid.perPage] as LabelCell, item }))
}
