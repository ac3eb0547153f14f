// The month's care work on record: water changes with their log entries, tasks ticked off, kit tests, the arrival.
import { planWaterChange } from '@shared/chemistry/water-change'
import { waterVolumeLitres, type TankShape } from '@shared/chemistry/volume'
import type { UserActor } from '../../access/actor'
import type { AppContext } from '../../context'
import type { Tank } from '../../models'
import { writeCareLog } from '../../care'
import { livestockService } from '../../care'
import { careTasksService, markTasksOfKindDone } from '../../care'
import { testKitService } from '../../test-kit'
import { DRAIN_MS, REFILL_MS } from './readings'
import { WATER_CHANGE_PERCENT, type CareDone, type DemoStory } from './story'

const iso = (ms: number) => new Date(ms).toISOString()

/**
 * A water change as the planner and the finish step record it. Written directly rather than through
 * the service, whose start and finish take the clock's time.
 */
async function writeWaterChange(ctx: AppContext, tank: Tank, done: CareDone, userId: number) {
  const shape = tank.dimensions as TankShape | null
  const fillHeightCm = shape ? shape.heightCm * 0.9 : 0
  const plan = shape
    ? {
        waterLitres: waterVolumeLitres(shape, fillHeightCm, tank.substrateDepthCm),
        ...planWaterChange({ shape, fillHeightCm, substrateDepthCm: tank.substrateDepthCm, heaterTopCm: tank.heater?.topCm, percent: WATER_CHANGE_PERCENT }),
      }
    : { litresOut: Math.round(tank.volumeLitres * WATER_CHANGE_PERCENT) / 100, percent: WATER_CHANGE_PERCENT }
  const litres = Math.round(plan.litresOut * 10) / 10
  const finishedAt = new Date(done.at + DRAIN_MS + REFILL_MS)
  await ctx.sequelize.transaction(async (transaction) => {
    const change = await ctx.models.WaterChange.create(
      {
        organizationId: tank.organizationId,
        tankId: tank.id,
        status: 'in_progress',
        plan,
        heaterOffConfirmed: false,
        temporaryRuleId: null,
        startedAt: new Date(done.at),
        startedBy: userId,
      },
      { transaction },
    )
    const newWaterTempC = tank.heater ? tank.heater.setPointC - 0.5 : 20
    const entry = await writeCareLog(
      ctx,
      {
        organizationId: tank.organizationId,
        tankId: tank.id,
        kind: 'water_change',
        at: finishedAt,
        userId,
        text: done.daysLate ? `Water change (${done.daysLate} days late: short-staffed)` : 'Water change',
        values: { litres, percent: WATER_CHANGE_PERCENT, dechlorinatorMl: Math.round(litres / 10), newWaterTempC },
        waterChangeId: change.id,
      },
      transaction,
    )
    await change.update(
      {
        status: 'finished',
        finishedAt,
        finishedBy: userId,
        litresReplaced: litres,
        dechlorinatorMl: Math.round(litres / 10),
        newWaterTempC,
        careLogEntryId: entry.id,
      },
      { transaction },
    )
    await markTasksOfKindDone(ctx, tank.id, 'water_change', finishedAt, userId, transaction)
  })
}

export async function seedCare(ctx: AppContext, story: DemoStory, tanks: Map<string, Tank>, actorFor: (email: string) => UserActor) {
  const tasks = careTasksService(ctx)
  const kits = testKitService(ctx)
  const taskIds = new Map<string, number>()
  for (const task of await ctx.models.CareTask.findAll()) taskIds.set(`${task.tankId}:${task.kind}`, task.id)

  for (const kit of story.testKits) {
    const tank = tanks.get(kit.tank)!
    await kits.create(actorFor(kit.by), tank.id, { takenAt: iso(kit.at), values: kit.values, notes: kit.notes })
  }
  for (const done of [...story.care].sort((a, b) => a.at - b.at)) {
    const tank = tanks.get(done.tank)!
    const actor = actorFor(done.by)
    if (done.kind === 'water_change') {
      await writeWaterChange(ctx, tank, done, actor.userId)
      continue
    }
    const notes = done.daysLate ? `${done.daysLate === 1 ? 'A day' : `${done.daysLate} days`} late: short-staffed` : ''
    await tasks.markDone(actor, taskIds.get(`${tank.id}:${done.kind}`)!, { at: iso(done.at), notes, values: {} })
  }

  const q = tanks.get(story.arrival.tank)
  if (q) {
    const { arrival } = story
    await livestockService(ctx).add(actorFor(arrival.by), q.id, {
      speciesKey: arrival.speciesKey,
      count: arrival.count,
      addedAt: iso(arrival.at),
      source: arrival.source,
      notes: arrival.notes,
    })
    // The quarantine started with the arrival.
    await ctx.sequelize.query('UPDATE tanks SET stage_changed_at = $1 WHERE id = $2', { bind: [new Date(arrival.at), q.id] })
  }
}
