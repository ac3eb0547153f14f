import type { Sequelize } from 'sequelize'
import type { LiveReading } from '@shared/schemas/live'
import { newestReadingsOfTanks } from '../readings'

/** A catch-up reaches back at most this far, whatever `since` asks for. */
export const CATCH_UP_SPAN_MS = 24 * 3600_000
/** At most this many readings per catch-up: the newest ones, oldest first. */
export const CATCH_UP_MAX_ROWS = 5000
/** Readings per catch-up frame. */
export const CATCH_UP_PAGE_ROWS = 1000

/**
 * Readings of these tanks stored after `since`, bounded by span and count, in pages. The caller
 * sends one page and waits until the socket has taken it before asking for the next.
 */
export async function catchUpPages(sequelize: Sequelize, tankIds: number[], since: string, now = Date.now()): Promise<LiveReading[][]> {
  const from = new Date(Math.max(new Date(since).getTime(), now - CATCH_UP_SPAN_MS))
  const rows = await newestReadingsOfTanks(sequelize, tankIds, from, CATCH_UP_MAX_ROWS)
  const pages: LiveReading[][] = []
  for (let i = 0; i < rows.length; i += CATCH_UP_PAGE_ROWS) {
    pages.push(
      rows.slice(i, i + CATCH_UP_PAGE_ROWS).map((r) => ({ tankId: r.tank_id, metric: r.metric, time: r.time.toISOString(), value: r.value, source: r.source })),
    )
  }
  return pages
}
