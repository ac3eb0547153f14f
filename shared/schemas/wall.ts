import type { ClockStyle } from './auth'
import { z } from 'zod'
import type { LatestResponse } from './series'
import type { Targets, TankKind, TankStage } from './tanks'
import type { TankState } from './tank-status'

/** A 15-minute mean of a tank's temperature (`t` the quarter's start). */
export interface WallTrendPoint {
  t: string
  value: number
}

export interface WallTank {
  id: number
  name: string
  kind: TankKind
  stage: TankStage
  sortOrder: number
  volumeLitres: number
  /** Inside height of the tank, cm, when its dimensions are known (for the water-level gauge). */
  heightCm: number | null
  heater: { watts: number; setPointC: number; topCm: number } | null
  lightSchedule: { on: string; off: string } | null
  targets: Targets
  latest: LatestResponse
  /**
   * Temperature over the last hours, for the tile's trend line; null when the answer left it out
   * (only the first `trends` tanks were asked for): GET /sites/:id/wall/trends sends it.
   */
  trend: WallTrendPoint[] | null
  state: TankState
  stateReasons: string[]
  openIncident: {
    id: number
    title: string
    severity: 'warning' | 'alarm'
    openedAt: string
    /** Acknowledged incidents stop the wall's chime. */
    state: 'open' | 'acknowledged'
    /** Opened inside a maintenance window: recorded, nobody told. */
    maintenance: boolean
    /** Part of a site-wide incident. */
    siteIncidentId: number | null
  } | null
  /** It has cleared and tripped again within its settle window: counted, not reopened as new. */
  flapping: { count: number; title: string } | null
  /** Inside a maintenance window for the site or this tank, until then. */
  maintenanceUntil: string | null
  maintenanceReason: string | null
  snoozedUntil: string | null
  lightOn: boolean | null
  lightScheduledOn: boolean | null
  newestReadingAt: string | null
  /** A tank being built: "build day 9 of about 28" (day 1 is the fill day). */
  buildDay?: { day: number; aboutDays: number | null } | null
}

export interface WallResponse {
  /** `clockStyle`: the organisation's 24- or 12-hour clock, for a display that has no signed-in person. */
  site: { id: number; name: string; timeZone: string; clockStyle: ClockStyle }
  generatedAt: string
  tanks: WallTank[]
  onDuty: Array<{ userId: number; name: string }>
  backupContact: { userId: number; name: string } | null
  openIncidents: number
  /** Open site-wide incidents: one fault on several tanks at once. */
  siteIncidents: Array<{ id: number; title: string; severity: 'warning' | 'alarm'; state: 'open' | 'acknowledged'; tanks: number }>
  overdueCareTasks: number | null
}

/** Tanks whose trend line one request may ask for: a page of the largest wall screen, with room. */
export const MAX_TREND_TANKS = 100

/**
 * GET /sites/:id/wall?trends=N: only the first N tanks in the wall's order bring their trend line
 * (a display asks for one screenful; the rest come page by page). Without it, every tank does.
 */
export const wallQuerySchema = z.object({ trends: z.coerce.number().int().min(0).max(100_000).optional() })

/** GET /sites/:id/wall/trends?tankIds=3,4,5: the trend lines of these tanks of the site. */
export const wallTrendsQuerySchema = z.object({
  tankIds: z
    .string()
    .regex(/^\d{1,10}(,\d{1,10})*$/, 'tank ids separated by commas')
    .transform((text) => [...new Set(text.split(',').map(Number))])
    .refine((ids) => ids.length <= MAX_TREND_TANKS, `at most ${MAX_TREND_TANKS} tanks`),
})

export interface WallTrendsResponse {
  /** One entry per tank asked for that is on the site's wall; a tank without readings has an empty line. */
  trends: Array<{ tankId: number; trend: WallTrendPoint[] }>
}

export const wallCredentialInputSchema = z.object({ name: z.string().trim().min(1, 'required').max(80) })

export interface PublicWallCredential {
  id: number
  name: string
  siteId: number
  createdAt: string
  lastUsedAt: string | null
  revokedAt: string | null
}

export interface CreatedWallCredential {
  credential: PublicWallCredential
  /** Relative, e.g. `/wall/3?key=…`; shown once, made absolute for the TV. */
  link: string
}
