import { watchUntil } from '@shared/care/livestock'
import { moveWarnings } from '@shared/livestock/move-check'
import type { BatchLoss, BatchMove, BatchMoveResult, BatchOut, PublicBatch } from '@shared/schemas/livestock'
import type { UserActor } from '../access/actor'
import { visibleTank } from '../access/scope'
import { instantNotAhead, tankPh, tankTemperature, writeCareLog } from '../care'
import type { AppContext } from '../context'
import type { LivestockEntry, Tank } from '../models'
import { badRequest, confirmNeeded } from '../platform/errors'
import { perContext } from '../platform/per-context'
import { aliveIn, presentBatch, tanksById, visibleBatch } from './batches'

const OUTCOME_WORDS = { sold: 'sold', to_client: "moved to a client's tank" } as const

/** A count within what is alive in the batch; absent means all of them. */
function countWithin(entry: LivestockEntry, count: number | undefined): number {
  const alive = aliveIn(entry)
  if (alive <= 0) throw badRequest('count: no animals left in this batch', { count: 'no animals left in this batch' })
  if (count === undefined) return alive
  if (count > alive) throw badRequest(`count: only ${alive} in the batch`, { count: `only ${alive} in the batch` })
  return count
}

export const batchMovesService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function present(actor: UserActor, entries: LivestockEntry[]): Promise<PublicBatch[]> {
    const tanks = await tanksById(
      ctx,
      actor.organizationId,
      entries.map((e) => e.tankId),
    )
    const now = new Date()
    return entries.map((e) => presentBatch(e, tanks.get(e.tankId)!, now))
  }

  /** What the target tank's state says about this move: open incidents, cycling, water far from the batch's. */
  async function checkMove(from: Tank, to: Tank) {
    const [openIncidents, fromPh, toPh, fromTemp, toTemp] = await Promise.all([
      models.Incident.findAll({ where: { tankId: to.id, state: ['open', 'acknowledged'] }, attributes: ['title'], order: [['openedAt', 'ASC']] }),
      tankPh(ctx, from),
      tankPh(ctx, to),
      tankTemperature(ctx, from),
      tankTemperature(ctx, to),
    ])
    return moveWarnings({
      targetName: to.name,
      targetStage: to.stage,
      openIncidents,
      from: { ph: fromPh?.value, tempC: fromTemp?.value },
      to: { ph: toPh?.value, tempC: toTemp?.value },
    })
  }

  return {
    /**
     * Moves the whole batch, or `count` of it split off as a new batch, into another tank. With
     * warnings and no `confirm`, nothing moves: 409 `confirm_needed` with the warnings.
     */
    async move(actor: UserActor, batchId: number, input: BatchMove): Promise<BatchMoveResult> {
      const at = instantNotAhead(input.at, 'at')
      const current = await visibleBatch(ctx, actor, batchId)
      const target = await visibleTank(ctx, actor, input.toTankId)
      if (target.id === current.tankId) throw badRequest('toTankId: the batch is already in this tank', { toTankId: 'the batch is already in this tank' })
      if (target.archivedAt) throw badRequest('toTankId: this tank is archived', { toTankId: 'this tank is archived' })
      const source = await visibleTank(ctx, actor, current.tankId)
      countWithin(current, input.count)
      const warnings = await checkMove(source, target)
      if (warnings.length && !input.confirm) throw confirmNeeded(`Moving into ${target.name} needs confirming`, { warnings })

      const [moved, from] = await sequelize.transaction(async (transaction) => {
        const entry = await visibleBatch(ctx, actor, batchId, transaction)
        const count = countWithin(entry, input.count)
        const whole = count === aliveIn(entry)
        let moved = entry
        if (whole) {
          await entry.update({ tankId: target.id, watchUntil: entry.category === 'plant' ? null : watchUntil(at) }, { transaction })
        } else {
          moved = await models.LivestockEntry.create(
            {
              organizationId: entry.organizationId,
              tankId: target.id,
              speciesKey: entry.speciesKey,
              name: entry.name,
              category: entry.category,
              count,
              addedAt: entry.addedAt,
              source: entry.source,
              notes: entry.notes,
              watchUntil: entry.category === 'plant' ? null : watchUntil(at),
              parentId: entry.id,
              createdBy: actor.userId,
            },
            { transaction },
          )
          await entry.update({ movedOut: entry.movedOut + count }, { transaction })
        }
        await models.LivestockEvent.create(
          {
            organizationId: entry.organizationId,
            livestockId: entry.id,
            kind: 'moved',
            at,
            count,
            fromTankId: source.id,
            toTankId: target.id,
            splitId: whole ? null : moved.id,
            userId: actor.userId,
          },
          { transaction },
        )
        const log = (tankId: number, kind: 'livestock_in' | 'livestock_out', text: string) =>
          writeCareLog(
            ctx,
            { organizationId: entry.organizationId, tankId, kind, at, userId: actor.userId, text, values: { count, livestockId: moved.id } },
            transaction,
          )
        await log(source.id, 'livestock_out', `Moved ${count} × ${entry.name} to ${target.name}`)
        await log(target.id, 'livestock_in', `Moved in ${count} × ${entry.name} from ${source.name}`)
        return [moved, entry]
      })
      const [movedView, fromView] = await present(actor, [moved, from])
      return { moved: movedView!, from: fromView!, warnings }
    },

    async lose(actor: UserActor, batchId: number, input: BatchLoss): Promise<PublicBatch> {
      const at = instantNotAhead(input.at, 'at')
      const entry = await sequelize.transaction(async (transaction) => {
        const entry = await visibleBatch(ctx, actor, batchId, transaction)
        const count = countWithin(entry, input.count)
        await entry.update({ losses: entry.losses + count, ...(count === aliveIn(entry) ? { removedAt: at } : {}) }, { transaction })
        await models.LivestockEvent.create(
          {
            organizationId: entry.organizationId,
            livestockId: entry.id,
            kind: 'lost',
            at,
            count,
            fromTankId: entry.tankId,
            cause: input.cause,
            userId: actor.userId,
          },
          { transaction },
        )
        await writeCareLog(
          ctx,
          {
            organizationId: entry.organizationId,
            tankId: entry.tankId,
            kind: 'livestock_out',
            at,
            userId: actor.userId,
            text: `${count} × ${entry.name} lost: ${input.cause}`,
            values: { losses: count, livestockId: entry.id },
          },
          transaction,
        )
        return entry
      })
      return (await present(actor, [entry]))[0]!
    },

    /** Animals leaving the business alive: sold, or gone to a client's tank. */
    async out(actor: UserActor, batchId: number, input: BatchOut): Promise<PublicBatch> {
      const at = instantNotAhead(input.at, 'at')
      const entry = await sequelize.transaction(async (transaction) => {
        const entry = await visibleBatch(ctx, actor, batchId, transaction)
        const count = countWithin(entry, input.count)
        const last = count === aliveIn(entry)
        await entry.update({ movedOut: entry.movedOut + count, ...(last ? { removedAt: at } : {}) }, { transaction })
        await models.LivestockEvent.create(
          {
            organizationId: entry.organizationId,
            livestockId: entry.id,
            kind: input.outcome,
            at,
            count,
            fromTankId: entry.tankId,
            destination: input.destination,
            userId: actor.userId,
          },
          { transaction },
        )
        const where = input.destination ? ` (${input.destination})` : ''
        await writeCareLog(
          ctx,
          {
            organizationId: entry.organizationId,
            tankId: entry.tankId,
            kind: 'livestock_out',
            at,
            userId: actor.userId,
            text: `${count} × ${entry.name} ${OUTCOME_WORDS[input.outcome]}${where}`,
            values: { count, livestockId: entry.id },
          },
          transaction,
        )
        return entry
      })
      return (await present(actor, [entry]))[0]!
    },
  }
})
