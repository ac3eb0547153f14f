import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import type { Tank } from '../models'

const HOUR_MS = 3600_000

/** The tank's newest reading of `metric` no older than `maxAgeMs`, from any source. */
export async function latestReading(ctx: AppContext, tankId: number, metric: string, maxAgeMs: number) {
  const rows = await ctx.sequelize.query<{ value: number; time: Date }>(
    `SELECT value, time FROM readings WHERE tank_id = $1 AND metric = $2 AND time > $3 ORDER BY time DESC LIMIT 1`,
    { bind: [tankId, metric, new Date(Date.now() - maxAgeMs)], type: QueryTypes.SELECT },
  )
  return rows[0] ?? null
}

/** The tank's temperature now: a reading of the last hour, else the heater's set point, else the target's middle. */
export async function tankTemperature(ctx: AppContext, tank: Tank) {
  const reading = await latestReading(ctx, tank.id, 'temperature', HOUR_MS)
  if (reading) return { value: reading.value, source: 'reading' as const }
  if (tank.heater) return { value: tank.heater.setPointC, source: 'heater_set_point' as const }
  const band = tank.targets.temperature
  return band ? { value: (band.min + band.max) / 2, source: 'target' as const } : null
}

/** The tank's pH: a reading of the last day (pH moves slowly, kits are read daily at most), else the target's middle. */
export async function tankPh(ctx: AppContext, tank: Tank) {
  const reading = await latestReading(ctx, tank.id, 'ph', 24 * HOUR_MS)
  if (reading) return { value: reading.value, source: 'reading' as const }
  const band = tank.targets.ph
  return band ? { value: (band.min + band.max) / 2, source: 'target' as const } : null
}

export type KitRow = { sourceKey: string; time: Date; metric: string; value: number }

/** Ammonia, nitrite and nitrate readings since `since`, oldest first. */
export async function nitrogenReadings(ctx: AppContext, tankId: number, since: Date): Promise<KitRow[]> {
  return ctx.sequelize.query<KitRow>(
    `SELECT source_key AS "sourceKey", time, metric, value FROM readings
     WHERE tank_id = $1 AND metric IN ('ammonia', 'nitrite', 'nitrate') AND time >= $2 ORDER BY time`,
    { bind: [tankId, since], type: QueryTypes.SELECT },
  )
}
