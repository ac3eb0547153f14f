import { isDeviceQuiet } from '@shared/schemas/devices'
import type { Targets, TankStage } from '@shared/schemas/tanks'
import type { TankStatus } from '@shared/schemas/tank-status'
import { tankState } from '@shared/tank-state'
import type { AppContext } from '../context'
import { incidentsOf } from '../incidents'
import { seriesService } from '../readings'

export interface StatusTank {
  id: number
  stage: TankStage
  targets: Targets
  archivedAt: Date | null
}

/**
 * Each tank's latest values, open incidents, silent devices and the state they add up to: the
 * one reading of "how is this tank now" that the wall and the tanks list both show.
 */
export async function tankStatuses(ctx: AppContext, tanks: StatusTank[], now = Date.now()): Promise<Map<number, TankStatus>> {
  const ids = tanks.map((t) => t.id)
  if (!ids.length) return new Map()
  const [latest, devices, open] = await Promise.all([
    seriesService(ctx).siteLatest(ids),
    ctx.models.Device.findAll({
      where: { tankId: ids, revokedAt: null },
      attributes: ['tankId', 'name', 'lastSeenAt', 'createdAt', 'intervalSeconds', 'revokedAt'],
      raw: true,
    }),
    incidentsOf(ctx).openForTanks(ids),
  ])
  const latestByTank = new Map(latest.map((l) => [l.tankId, l.metrics]))
  // Grouped once: a site of 1,000 tanks would otherwise read a million model attributes.
  const devicesByTank = groupByTank(devices)
  const openByTank = groupByTank(open)
  return new Map(
    tanks.map((tank) => {
      const metrics = latestByTank.get(tank.id) ?? {}
      const mine = devicesByTank.get(tank.id) ?? []
      const incidents = openByTank.get(tank.id) ?? []
      // Nobody expects readings from an empty or archived tank, so its devices cannot fall quiet.
      const expectsReadings = tank.stage !== 'empty' && !tank.archivedAt
      const quietDevices = expectsReadings ? mine.filter((d) => isDeviceQuiet(d, now)).map((d) => d.name) : []
      const { state, reasons } = tankState({
        latest: metrics,
        targets: tank.targets,
        openIncidents: incidents.map((i) => ({ severity: i.severity, title: i.title })),
        quietDevices,
        hasDevices: mine.length > 0,
      })
      const status: TankStatus = {
        state,
        stateReasons: reasons,
        latest: metrics,
        openIncidents: incidents.map((i) => ({
          id: i.id,
          title: i.title,
          severity: i.severity,
          openedAt: i.openedAt.toISOString(),
          state: i.state === 'acknowledged' ? 'acknowledged' : 'open',
          maintenance: i.maintenance,
          siteIncidentId: i.siteIncidentId ?? null,
          flapCount: i.flapCount,
        })),
        quietDevices,
        hasDevices: mine.length > 0,
      }
      return [tank.id, status] as const
    }),
  )
}

function groupByTank<T extends { tankId: number | null }>(rows: T[]): Map<number | null, T[]> {
  const groups = new Map<number | null, T[]>()
  for (const row of rows) {
    const tankId = row.tankId
    const group = groups.get(tankId)
    if (group) group.push(row)
    else groups.set(tankId, [row])
  }
  return groups
}
