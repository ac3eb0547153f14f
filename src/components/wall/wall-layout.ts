/**
 * How the wall fills a screen: the largest tiles that fit every tank, or pages of the smallest
 * readable tiles when they cannot all fit. A phone or narrow tablet scrolls instead.
 */
export interface WallLayout {
  columns: number
  rows: number
  perPage: number
  pages: number
  tileWidth: number
  tileHeight: number
  /** Scroll (small screens) rather than pages that turn by themselves. */
  scroll: boolean
}

export interface Screen {
  width: number
  height: number
}

/** Smallest tile whose temperature (about a fifth of its height) still reads from about 3 m. */
export const MIN_TILE = { width: 300, height: 230 } as const
export const GAP_PX = 12
/** Below this width or height the wall is held in a hand, not mounted. */
const KIOSK_MIN = { width: 900, height: 560 } as const

export function wallLayout(tankCount: number, screen: Screen): WallLayout {
  const count = Math.max(0, Math.floor(tankCount))
  if (screen.width < KIOSK_MIN.width || screen.height < KIOSK_MIN.height) {
    const columns = Math.max(1, Math.floor((screen.width + GAP_PX) / (MIN_TILE.width + GAP_PX)))
    const tileWidth = (screen.width - GAP_PX * (columns - 1)) / columns
    return { columns, rows: Math.ceil(count / columns), perPage: count, pages: 1, tileWidth, tileHeight: MIN_TILE.height, scroll: true }
  }
  const fit = (columns: number, rows: number) => ({
    tileWidth: (screen.width - GAP_PX * (columns - 1)) / columns,
    tileHeight: (screen.height - GAP_PX * (rows - 1)) / rows,
  })
  const maxColumns = Math.max(1, Math.floor((screen.width + GAP_PX) / (MIN_TILE.width + GAP_PX)))
  const maxRows = Math.max(1, Math.floor((screen.height + GAP_PX) / (MIN_TILE.height + GAP_PX)))

  let best: WallLayout | null = null
  let bestScale = 0
  for (let columns = 1; columns <= Math.min(maxColumns, Math.max(1, count)); columns++) {
    const rows = Math.max(1, Math.ceil(count / columns))
    if (rows > maxRows) continue
    const { tileWidth, tileHeight } = fit(columns, rows)
    // Tiles grow evenly; the tighter side decides how large the text can get.
    const scale = Math.min(tileWidth / MIN_TILE.width, tileHeight / MIN_TILE.height)
    if (scale > bestScale) {
      bestScale = scale
      best = { columns, rows, perPage: columns * rows, pages: 1, tileWidth, tileHeight, scroll: false }
    }
  }
  if (best) return best
  const perPage = maxColumns * maxRows
  return { columns: maxColumns, rows: maxRows, perPage, pages: Math.ceil(count / perPage), ...fit(maxColumns, maxRows), scroll: false }
}

/**
 * How many tiles one screenful of this size can hold at most (a page, or a phone's first screen):
 * the wall asks for the trend lines of that many tanks with its data, and the rest as they come up.
 */
export function tilesOnOneScreen(screen: Screen): number {
  const columns = Math.max(1, Math.floor((screen.width + GAP_PX) / (MIN_TILE.width + GAP_PX)))
  const rows = Math.max(1, Math.ceil((screen.height + GAP_PX) / (MIN_TILE.height + GAP_PX)))
  return columns * rows
}

/** The tanks on one page (zero-based), in the server's order. */
export function pageSlice<T>(items: T[], layout: WallLayout, page: number): T[] {
  if (layout.scroll || layout.pages <= 1) return items
  const safe = ((page % layout.pages) + layout.pages) % layout.pages
  return items.slice(safe * layout.perPage, (safe + 1) * layout.perPage)
}
