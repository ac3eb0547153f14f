// A month of history for the demo shop: readings in bulk, the rollups retention would have left,
// care work, kit tests, an arrival in quarantine, photos and past incidents.
import { QueryTypes } from 'sequelize'
import type { UserActor } from '../../access/actor'
import type { AppContext } from '../../context'
import type { Tank } from '../../models'
import { devicesService } from '../../devices'
import { calibrationsService } from '../../calibration'
import { photosService } from '../../photos'
import { retentionService } from '../../readings'
import { insertDeviceSeries } from '../../readings'
import { seedFrom } from '../../../simulator/model/random'
import { DEMO_NODE_NAME, DEMO_NODE_INTERVAL_SECONDS } from '../demo-scenario'
import { seedCare } from './care'
import { seedIncidents } from './incidents'
import { tankScenePng } from './photos'
import { HISTORY_METRICS, tankHistory, type TankHistory } from './readings'
import { demoStory } from './story'

/** How often the demo nodes reported in the past month (the live simulator is faster). */
export const HISTORY_REPORT_EVERY_MS = 5 * 60_000

export type HistorySeedResult = { readings: number; rolledUpHours: number; incidents: number; ms: number }

type TankWithSite = Tank & { site?: { timeZone: string } }

/** All of one tank's readings in one statement: columns as arrays, unnested by PostgreSQL. */
async function insertHistory(ctx: AppContext, tankId: number, deviceId: number, history: TankHistory): Promise<number> {
  const metrics: string[] = []
  const seconds: number[] = []
  const values: number[] = []
  for (const metric of HISTORY_METRICS) {
    history.values[metric].forEach((value, i) => {
      metrics.push(metric)
      seconds.push(history.times[i]! / 1000)
      values.push(value)
    })
  }
  await insertDeviceSeries(ctx.sequelize, { sourceKey: `d:${deviceId}`, tankId, metrics, epochSeconds: seconds, values })
  return values.length
}

/** Seeds the history into a freshly seeded demo organization; `now` is the end of the history. */
export async function seedDemoHistory(ctx: AppContext, now = Date.now()): Promise<HistorySeedResult> {
  const started = performance.now()
  const { models, sequelize } = ctx
  const users = await models.User.findAll()
  const owner = users.find((u) => u.role === 'owner')!
  const actorFor = (email: string): UserActor => {
    const user = users.find((u) => u.email === email) ?? owner
    return { kind: 'user', userId: user.id, organizationId: user.organizationId, role: user.role, siteIds: null, sessionId: 'seed' }
  }
  const tanks = (await models.Tank.findAll({ include: [{ association: 'site', attributes: ['timeZone'] }], order: [['id', 'ASC']] })) as TankWithSite[]
  const live = tanks.filter((t) => t.stage !== 'empty')
  const zoneOf = (t: TankWithSite) => t.site?.timeZone ?? 'UTC'
  const story = demoStory(
    live.map((t) => ({ name: t.name, kind: t.kind, stage: t.stage, timeZone: zoneOf(t) })),
    now,
  )
  const from = new Date(story.fromMs)

  // The shop has been running all month: tanks, their rules and care tasks date from its start.
  for (const table of ['tanks', 'watch_rules', 'care_tasks']) {
    await sequelize.query(`UPDATE ${table} SET created_at = $1`, { bind: [from] })
  }
  await sequelize.query('UPDATE tanks SET stage_changed_at = $1', { bind: [from] })

  const devices = devicesService(ctx)
  // Invented demo figures: a healthy probe reading a little high in both buffers.
  const DEMO_PH_CALIBRATION = (at: number) => ({
    metric: 'ph' as const,
    performedAt: new Date(at).toISOString(),
    notes: '',
    points: [
      { buffer: 7, temperatureC: 24, reading: 7.04 },
      { buffer: 4.01, temperatureC: 24, reading: 4.09 },
    ],
  })
  const histories = new Map<number, TankHistory>()
  // PostgreSQL stores one tank's month while the next one is computed here.
  const inserts: Array<Promise<number>> = []
  for (const tank of live) {
    const { device } = await devices.create(actorFor(owner.email), {
      tankId: tank.id,
      name: DEMO_NODE_NAME,
      metrics: [...HISTORY_METRICS],
      intervalSeconds: DEMO_NODE_INTERVAL_SECONDS,
    })
    // Each probe was calibrated nine days ago, which also ticks off its care task.
    await calibrationsService(ctx).record(actorFor(owner.email), device.id, DEMO_PH_CALIBRATION(now - 9 * 86400_000))
    const history = tankHistory(
      {
        name: tank.name,
        kind: tank.kind,
        dimensions: tank.dimensions,
        volumeLitres: tank.volumeLitres,
        heater: tank.heater,
        lightSchedule: tank.lightSchedule,
        timeZone: zoneOf(tank),
        substrateDepthCm: tank.substrateDepthCm,
      },
      { fromMs: story.fromMs, toMs: now, reportEveryMs: HISTORY_REPORT_EVERY_MS, seed: seedFrom(1, tank.name), episodes: story.episodes.get(tank.name) ?? [] },
    )
    histories.set(tank.id, history)
    inserts.push(insertHistory(ctx, tank.id, device.id, history))
    await sequelize.query('UPDATE devices SET created_at = $1, last_seen_at = $2 WHERE id = $3', {
      bind: [from, new Date(history.times.at(-1) ?? now), device.id],
    })
  }
  const readings = (await Promise.all(inserts)).reduce((a, b) => a + b, 0)

  const byName = new Map<string, Tank>(live.map((t) => [t.name, t]))
  await seedCare(ctx, story, byName, actorFor)
  const photos = photosService(ctx)
  for (const photo of story.photos) {
    const tank = byName.get(photo.tank)!
    const png = await tankScenePng(tank.kind, `${tank.name}@${photo.at}`)
    await photos.upload(actorFor(photo.by), tank.id, png, { caption: photo.caption, takenAt: new Date(photo.at).toISOString() })
  }
  const incidents = await seedIncidents(ctx, {
    tanks: live.map((t) => ({
      id: t.id,
      name: t.name,
      siteId: t.siteId,
      organizationId: t.organizationId,
      heater: t.heater,
      lightSchedule: t.lightSchedule,
      timeZone: zoneOf(t),
    })),
    histories,
    episodes: story.episodes,
    notes: story.incidentNotes,
    fromMs: story.fromMs,
    toMs: now,
  })

  // What the hourly retention job would have left by now: old raw rows folded into their hours.
  const retention = await retentionService(ctx).rollUpAndPrune({ rawRetentionDays: ctx.config.rawRetentionDays, now: new Date(now) })
  await sequelize.query('ANALYZE readings', { type: QueryTypes.RAW })
  return { readings, rolledUpHours: retention.rolledUpHours, incidents, ms: Math.round(performance.now() - started) }
}
