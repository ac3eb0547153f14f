import { QueryTypes, type Sequelize } from 'sequelize'
import type { LiveReading } from '@shared/schemas/live'

/** A catch-up reaches back at most this far, whatever `since` asks for. */
export const CATCH_UP_SPAN_MS = 24 * 3600_000
/** At most this many readings per catch-up: the newest ones, oldest first. */
export const CATCH_UP_MAX_ROWS = 5000
/** Readings per catch-up frame. */
export const CATCH_UP_PAGE_ROWS = 1000

type Row = { tank_id: number; metric: string; time: Date; value: number; source: LiveReading['source'] }

/**
 * Readings of these tanks stored after `since`, bounded by span and count, in pages. The caller
 * sends one page and waits until the socket has taken it before asking for the next.
 */
export async function catchUpPages(sequelize: Sequelize, tankIds: number[], since: string, now = Date.now()): Promise<LiveReading[][]> {
  const from = new Date(Math.max(new Date(since).getTime(), now - CATCH_UP_SPAN_MS))
  const rows = await sequelize.query<Row>(
    `SELECT tank_id, metric, time, value, source FROM (
       SELECT tank_id, metric, time, value, source FROM readings
        WHERE tank_id = ANY($tanks) AND time > $from ORDER BY time DESC LIMIT ${CATCH_UP_MAX_ROWS}
     ) newest ORDER BY time`,
    { bind: { tanks: tankIds, from }, type: QueryTypes.SELECT },
  )
  const pages: LiveReading[][] = []
  for (let i = 0; i < rows.length; i += CATCH_UP_PAGE_ROWS) {
    pages.push(
      rows
        .slice(i, i + CATCH_UP_PAGE_ROWS)
        .map((r) => ({ tankId: r.tank_id, metric: r.metric, time: r.time.toISOString(), value: r.value, source: r.source })),
    )
  }
  return pages
}
