import { Op } from 'sequelize'
import { acclimationPlan } from '@shared/care/acclimation'
import { cyclingStatus, newPlantsNote, type KitTest } from '@shared/care/cycling'
import { quarantineStatus, stockingWarnings, watchUntil } from '@shared/care/livestock'
import { speciesByKey } from '@shared/care/species'
import type { LivestockInput, LivestockUpdate } from '@shared/schemas/care'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { LivestockEntry, Tank } from '../models'
import { instantNotAhead, writeCareLog } from './care-log'
import { nitrogenReadings, tankPh, tankTemperature } from './care-readings'
import { stageChangedAt } from './quarantine'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

const DAY_MS = 86_400_000
/** Cycling a new tank takes weeks; a longer look back only adds old, settled tests. */
const CYCLING_LOOKBACK_DAYS = 120

function present(e: LivestockEntry) {
  return {
    id: e.id,
    tankId: e.tankId,
    speciesKey: e.speciesKey,
    species: e.speciesKey ? (speciesByKey(e.speciesKey) ?? null) : null,
    name: e.name,
    category: e.category,
    count: e.count,
    losses: e.losses,
    movedOut: e.movedOut,
    parentId: e.parentId ?? null,
    addedAt: e.addedAt.toISOString(),
    source: e.source,
    notes: e.notes,
    removedAt: e.removedAt?.toISOString() ?? null,
    watchUntil: e.watchUntil?.toISOString() ?? null,
  }
}

/** The close-watch period still running on the tank, if any (the latest end of its arrivals'). */
export async function tankWatchUntil(ctx: AppContext, tankIds: number[], now = new Date()) {
  const rows = await ctx.models.LivestockEntry.findAll({ where: { tankId: tankIds, watchUntil: { [Op.gt]: now } }, attributes: ['tankId', 'watchUntil'] })
  const result = new Map<number, Date>()
  for (const r of rows) {
    const current = result.get(r.tankId)
    if (r.watchUntil && (!current || r.watchUntil > current)) result.set(r.tankId, r.watchUntil)
  }
  return result
}

/** Kit readings stored together (one entry, one time) make one test. */
export function groupTests(rows: Awaited<ReturnType<typeof nitrogenReadings>>): KitTest[] {
  const tests = new Map<string, KitTest>()
  for (const r of rows) {
    const at = new Date(r.time).getTime()
    const key = `${r.sourceKey}@${at}`
    const test = tests.get(key) ?? { at }
    test[r.metric as 'ammonia' | 'nitrite' | 'nitrate'] = r.value
    tests.set(key, test)
  }
  return [...tests.values()]
}

export const livestockService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function quarantineOf(tank: Tank, now: Date) {
    if (tank.stage !== 'quarantine') return null
    return quarantineStatus(await stageChangedAt(ctx, tank.id), now)
  }

  async function findEntry(actor: UserActor, tankId: number, entryId: number) {
    const tank = await visibleTank(ctx, actor, tankId)
    const entry = await models.LivestockEntry.findOne({ where: { id: entryId, tankId: tank.id } })
    if (!entry) throw notFound('Livestock entry not found')
    return { tank, entry }
  }

  return {
    async list(actor: UserActor, tankId: number, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      const entries = await models.LivestockEntry.findAll({
        where: { tankId: tank.id },
        order: [
          ['addedAt', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const watch = (await tankWatchUntil(ctx, [tank.id], now)).get(tank.id)
      return { entries: entries.map(present), watchUntil: watch?.toISOString() ?? null, quarantine: await quarantineOf(tank, now) }
    },

    async add(actor: UserActor, tankId: number, input: LivestockInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const species = input.speciesKey ? speciesByKey(input.speciesKey) : undefined
      const category = species?.category ?? input.category ?? 'fish'
      const addedAt = instantNotAhead(input.addedAt, 'addedAt')
      const animal = category !== 'plant'
      const warnings = stockingWarnings({ kind: tank.kind, stage: tank.stage, targets: tank.targets }, species, category)
      let acclimation = null
      if (animal) {
        const [temp, ph] = await Promise.all([tankTemperature(ctx, tank), tankPh(ctx, tank)])
        try {
          acclimation = {
            ...acclimationPlan({ ...input.acclimation, tankTempC: temp?.value, tankPh: ph?.value }),
            tankTempC: temp ? { value: temp.value, source: temp.source } : null,
            tankPh: ph ? { value: ph.value, source: ph.source } : null,
          }
        } catch (error) {
          if (!(error instanceof RangeError)) throw error
          throw badRequest(`acclimation: ${error.message}`, { acclimation: error.message })
        }
      }
      const name = input.name ?? species?.commonName ?? ''
      const entry = await sequelize.transaction(async (transaction) => {
        const entry = await models.LivestockEntry.create(
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            speciesKey: input.speciesKey ?? null,
            name,
            category,
            count: input.count,
            addedAt,
            source: input.source,
            notes: input.notes,
            watchUntil: animal ? watchUntil(addedAt) : null,
            createdBy: actor.userId,
          },
          { transaction },
        )
        await writeCareLog(
          ctx,
          {
            organizationId: actor.organizationId,
            tankId: tank.id,
            kind: 'livestock_in',
            at: addedAt,
            userId: actor.userId,
            text: `Added ${input.count} × ${name}`,
            values: { count: input.count, category, ...(input.speciesKey ? { speciesKey: input.speciesKey } : {}), livestockId: entry.id },
          },
          transaction,
        )
        await models.LivestockEvent.create(
          {
            organizationId: actor.organizationId,
            livestockId: entry.id,
            kind: 'arrived',
            at: addedAt,
            count: input.count,
            toTankId: tank.id,
            userId: actor.userId,
          },
          { transaction },
        )
        return entry
      })
      return { entry: present(entry), warnings, acclimation, watchUntil: entry.watchUntil?.toISOString() ?? null }
    },

    /** Counts, losses and removal; losses and a removal go to the care log as livestock out. */
    async update(actor: UserActor, tankId: number, entryId: number, changes: LivestockUpdate) {
      const { tank, entry } = await findEntry(actor, tankId, entryId)
      const lost = changes.losses !== undefined ? changes.losses - entry.losses : 0
      if (lost < 0) throw badRequest('losses: cannot go down; losses are a running total', { losses: 'cannot go down' })
      const count = changes.count ?? entry.count
      if ((changes.losses ?? entry.losses) + entry.movedOut > count) {
        const field = changes.losses !== undefined ? 'losses' : 'count'
        throw badRequest(`${field}: more than the batch holds`, { [field]: 'more than the batch holds' })
      }
      const removedAt = typeof changes.removedAt === 'string' ? instantNotAhead(changes.removedAt, 'removedAt') : changes.removedAt
      const wasRemoved = entry.removedAt !== null
      await sequelize.transaction(async (transaction) => {
        const { removedAt: _text, ...rest } = changes
        await entry.update({ ...rest, ...(removedAt !== undefined ? { removedAt } : {}) }, { transaction })
        const out = (text: string, values: Record<string, number>) =>
          writeCareLog(
            ctx,
            {
              organizationId: actor.organizationId,
              tankId: tank.id,
              kind: 'livestock_out',
              at: new Date(),
              userId: actor.userId,
              text,
              values: { ...values, livestockId: entry.id },
            },
            transaction,
          )
        const event = (kind: 'lost' | 'removed', count: number) =>
          models.LivestockEvent.create(
            { organizationId: actor.organizationId, livestockId: entry.id, kind, at: new Date(), count, fromTankId: tank.id, userId: actor.userId },
            { transaction },
          )
        if (lost > 0) {
          await out(`${lost} × ${entry.name} lost`, { losses: lost })
          await event('lost', lost)
        }
        if (changes.removedAt && !wasRemoved) {
          await out(`${entry.name} removed`, { count: entry.count })
          await event('removed', entry.count - entry.losses - entry.movedOut)
        }
      })
      return present(entry)
    },

    async cycling(actor: UserActor, tankId: number, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      const rows = await nitrogenReadings(ctx, tank.id, new Date(now.getTime() - CYCLING_LOOKBACK_DAYS * DAY_MS))
      const plants = await models.LivestockEntry.findAll({ where: { tankId: tank.id, category: 'plant' }, attributes: ['addedAt'] })
      const status = cyclingStatus(groupTests(rows))
      return {
        tankId: tank.id,
        stage: tank.stage,
        ...status,
        newPlants: newPlantsNote(
          plants.map((p) => p.addedAt),
          now,
        ),
        suggestion: status.cycled && tank.stage === 'cycling' ? 'The tank reads as cycled: set its stage to established' : null,
      }
    },
  }
})
