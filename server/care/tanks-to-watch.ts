import { QueryTypes } from 'sequelize'
import { quarantineStatus, type QuarantineStatus } from '@shared/care/livestock'
import type { AppContext } from '../context'

/** A live tank worth a look beyond its tasks: in quarantine, or with new arrivals under watch. */
export type TankToWatch = {
  tank: { id: number; name: string }
  site: { id: number; name: string; timeZone: string }
  quarantine: QuarantineStatus | null
  /** End of the close-watch period after the latest arrivals, when still running. */
  watchUntil: string | null
}

type Row = { id: number; name: string; stage: string; stageChangedAt: Date; siteId: number; siteName: string; timeZone: string; watchUntil: Date | null }

/**
 * Tanks at the given sites that are in quarantine or under an acclimation watch at `now`,
 * by site then tank name. No actor: the caller has scoped the site ids. One query.
 */
export async function tanksToWatch(ctx: AppContext, siteIds: number[], now = new Date()): Promise<TankToWatch[]> {
  if (!siteIds.length) return []
  const rows = await ctx.sequelize.query<Row>(
    `SELECT t.id, t.name, t.stage, t.stage_changed_at AS "stageChangedAt", s.id AS "siteId", s.name AS "siteName", s.time_zone AS "timeZone",
            (SELECT max(l.watch_until) FROM livestock l WHERE l.tank_id = t.id AND l.removed_at IS NULL AND l.watch_until > :now) AS "watchUntil"
     FROM tanks t JOIN sites s ON s.id = t.site_id
     WHERE t.site_id IN (:siteIds) AND t.archived_at IS NULL AND s.archived_at IS NULL
     ORDER BY s.name, s.id, t.name, t.id`,
    { type: QueryTypes.SELECT, replacements: { siteIds, now } },
  )
  return rows
    .filter((r) => r.stage === 'quarantine' || r.watchUntil)
    .map((r) => ({
      tank: { id: r.id, name: r.name },
      site: { id: r.siteId, name: r.siteName, timeZone: r.timeZone },
      quarantine: r.stage === 'quarantine' ? quarantineStatus(new Date(r.stageChangedAt), now) : null,
      watchUntil: r.watchUntil ? new Date(r.watchUntil).toISOString() : null,
    }))
}
