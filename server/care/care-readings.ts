import type { AppContext } from '../context'
import type { Tank } from '../models'
import { newestReadingAfter, nitrogenRows, type KitRow } from '../readings'

const HOUR_MS = 3600_000

/** The tank's newest reading of `metric` no older than `maxAgeMs`, from any source. */
export async function latestReading(ctx: AppContext, tankId: number, metric: string, maxAgeMs: number) {
  return newestReadingAfter(ctx.sequelize, tankId, metric, new Date(Date.now() - maxAgeMs))
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

export type { KitRow }

/** Ammonia, nitrite and nitrate readings since `since`, oldest first. */
export async function nitrogenReadings(ctx: AppContext, tankId: number, since: Date): Promise<KitRow[]> {
  return nitrogenRows(ctx.sequelize, tankId, since)
}
