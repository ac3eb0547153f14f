import { Op, type Transaction } from 'sequelize'
import { quarantineStatus } from '@shared/care/livestock'
import type { BatchDetail, BatchListQuery, PublicBatch, PublicBatchEvent } from '@shared/schemas/livestock'
import type { Actor, UserActor } from '../access/actor'
import { siteScope, visibleTank } from '../access/scope'
import type { AppContext } from '../context'
import type { LivestockEntry, LivestockEvent } from '../models'
import { notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'

const DAY_MS = 86_400_000
/** A batch split from a split from …: deeper than this is a loop in the data, not a history. */
const MAX_LINEAGE = 50

type Named = { id: number; name: string }
export type BatchTank = Named & { stage: string; site: Named & { timeZone: string } }

export const aliveIn = (e: LivestockEntry) => e.count - e.losses - e.movedOut

export function presentBatch(e: LivestockEntry, tank: BatchTank, now: Date): PublicBatch {
  return {
    id: e.id,
    parentId: e.parentId ?? null,
    name: e.name,
    speciesKey: e.speciesKey,
    category: e.category,
    tank: { id: tank.id, name: tank.name, stage: tank.stage },
    site: tank.site,
    supplier: e.source,
    arrivedAt: e.addedAt.toISOString(),
    count: e.count,
    losses: e.losses,
    movedOut: e.movedOut,
    alive: aliveIn(e),
    closedAt: e.removedAt?.toISOString() ?? null,
    daysSinceArrival: Math.max(0, Math.floor((now.getTime() - e.addedAt.getTime()) / DAY_MS)),
    quarantine: tank.stage === 'quarantine' && !e.removedAt ? quarantineStatus(e.addedAt, now) : null,
  }
}

/** Tanks with their sites, by id, for presenting batches and events (archived tanks included: history keeps them). */
export async function tanksById(ctx: AppContext, organizationId: number, ids: number[]): Promise<Map<number, BatchTank>> {
  const unique = [...new Set(ids)]
  if (!unique.length) return new Map()
  const rows = await ctx.models.Tank.findAll({
    where: { id: unique, organizationId },
    include: [{ association: 'site', attributes: ['id', 'name', 'timeZone'] }],
  })
  return new Map(
    rows.map((t) => {
      const site = (t as unknown as { site: Named & { timeZone: string } }).site
      return [t.id, { id: t.id, name: t.name, stage: t.stage, site: { id: site.id, name: site.name, timeZone: site.timeZone } }]
    }),
  )
}

/** The batch, if the actor may see its tank; locked for update inside a transaction. */
export async function visibleBatch(ctx: AppContext, actor: Actor, id: number, transaction?: Transaction) {
  const entry = await ctx.models.LivestockEntry.findOne({
    where: { id, organizationId: actor.organizationId },
    ...(transaction ? { transaction, lock: transaction.LOCK.UPDATE } : {}),
  })
  if (!entry) throw notFound('Batch not found')
  await visibleTank(ctx, actor, entry.tankId)
  return entry
}

type Step = { event: LivestockEvent; movesBatch: boolean }

/**
 * The batch's events with those of the batches it was split from, up to each split: a split-off
 * batch shares its parent's past. `movesBatch` says whether a move took these animals along.
 */
async function lineageEvents(ctx: AppContext, entry: LivestockEntry): Promise<Step[]> {
  const chain: LivestockEntry[] = [entry]
  while (chain.length < MAX_LINEAGE) {
    const parentId = chain.at(-1)!.parentId
    if (!parentId) break
    const parent = await ctx.models.LivestockEntry.findByPk(parentId)
    if (!parent) break
    chain.push(parent)
  }
  const events = await ctx.models.LivestockEvent.findAll({
    where: { livestockId: chain.map((c) => c.id) },
    order: [
      ['at', 'ASC'],
      ['id', 'ASC'],
    ],
  })
  const steps: Step[] = []
  for (let i = chain.length - 1; i >= 0; i--) {
    const batch = chain[i]!
    const child = chain[i - 1]
    const own = events.filter((e) => e.livestockId === batch.id)
    // Up to and including the move that split the child off; the rest is the parent's alone.
    const split = child ? own.findIndex((e) => e.splitId === child.id) : -1
    const kept = child ? (split >= 0 ? own.slice(0, split + 1) : own.filter((e) => e.at <= child.createdAt)) : own
    for (const event of kept) steps.push({ event, movesBatch: event.kind === 'moved' && (event.splitId === null || event.splitId === child?.id) })
  }
  return steps
}

export const batchesService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function presentEvents(organizationId: number, steps: Step[], tanks: Map<number, BatchTank>): Promise<PublicBatchEvent[]> {
    const userIds = [...new Set(steps.map((s) => s.event.userId).filter((id): id is number => id !== null))]
    const users = userIds.length ? await models.User.findAll({ attributes: ['id', 'name'], where: { id: userIds, organizationId } }) : []
    const names = new Map(users.map((u) => [u.id, u.name]))
    const named = (id: number | null) => (id === null ? null : { id, name: tanks.get(id)?.name ?? 'former tank' })
    return steps.map(({ event: e }) => ({
      id: e.id,
      batchId: e.livestockId,
      kind: e.kind,
      at: e.at.toISOString(),
      count: e.count,
      fromTank: named(e.fromTankId ?? null),
      toTank: named(e.toTankId ?? null),
      cause: e.cause,
      destination: e.destination,
      by: e.userId === null ? null : { id: e.userId, name: names.get(e.userId) ?? 'former user' },
    }))
  }

  return {
    async list(actor: UserActor, query: BatchListQuery, now = new Date()): Promise<PublicBatch[]> {
      const tankWhere = { ...siteScope(actor, 'siteId'), ...(query.siteId ? { siteId: query.siteId } : {}), ...(query.tankId ? { id: query.tankId } : {}) }
      const tanks = await models.Tank.findAll({ attributes: ['id'], where: tankWhere })
      const entries = await models.LivestockEntry.findAll({
        where: {
          organizationId: actor.organizationId,
          tankId: tanks.map((t) => t.id),
          category: { [Op.ne]: 'plant' },
          ...(query.status === 'current' ? { removedAt: null } : {}),
        },
        order: [
          ['addedAt', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const byId = await tanksById(
        ctx,
        actor.organizationId,
        entries.map((e) => e.tankId),
      )
      return entries.map((e) => presentBatch(e, byId.get(e.tankId)!, now))
    },

    async get(actor: UserActor, id: number, now = new Date()): Promise<BatchDetail> {
      const entry = await visibleBatch(ctx, actor, id)
      const steps = await lineageEvents(ctx, entry)
      const tankIds = [entry.tankId, ...steps.flatMap((s) => [s.event.fromTankId, s.event.toTankId].filter((t): t is number => t != null))]
      const tanks = await tanksById(ctx, actor.organizationId, tankIds)
      const lived: number[] = []
      for (const { event, movesBatch } of steps) {
        const to = event.kind === 'arrived' ? event.toTankId : movesBatch ? event.toTankId : null
        if (to != null && lived.at(-1) !== to) lived.push(to)
      }
      if (lived.at(-1) !== entry.tankId) lived.push(entry.tankId)
      return {
        ...presentBatch(entry, tanks.get(entry.tankId)!, now),
        history: await presentEvents(actor.organizationId, steps, tanks),
        tanks: lived.map((tankId) => ({ id: tankId, name: tanks.get(tankId)?.name ?? 'former tank' })),
      }
    },
  }
})
