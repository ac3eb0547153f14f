import { Op, UniqueConstraintError } from 'sequelize'
import { METRICS, toCanonical } from '@shared/metrics/index'
import { TEST_KIT_EDIT_WINDOW_HOURS, type KitValue, type PublicTestKitEntry, type TestKitEntryInput } from '@shared/schemas/test-kit'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, conflict, forbidden, notFound } from '../platform/errors'
import { insertReadings, type ReadingRow } from '../readings'
import { checkReading } from '../readings'
import { deleteReadingsOfSource } from '../readings'
import type { TestKitEntry } from '../models'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'
import { probeChecksFor } from './probe-checks'

const sourceKey = (entryId: number) => `k:${entryId}`

/**
 * A kit value in a unit that needs the water temperature (a hydrometer's specific gravity at the
 * temperature it was read, oxygen in % saturation) is restated in the canonical unit with the
 * entry's own temperature; the device path has no such context and refuses those units.
 */
function withEntryContext(value: KitValue, values: KitValue[]): { ok: true; value: KitValue } | { ok: false; reason: string } {
  const def = METRICS[value.metric]
  if (def.units[value.unit]?.needs !== 'temperatureC') return { ok: true, value }
  const temperature = values.find((v) => v.metric === 'temperature')
  const temperatureC = temperature ? toCanonical('temperature', temperature.value, temperature.unit) : null
  if (!temperatureC?.ok) return { ok: false, reason: `${def.label} in ${def.units[value.unit]?.label} needs the water temperature in the same entry` }
  const converted = toCanonical(value.metric, value.value, value.unit, { temperatureC: temperatureC.value })
  return converted.ok ? { ok: true, value: { metric: value.metric, value: converted.value, unit: def.unit } } : converted
}

/** Keepers' test-kit entries: readings with source `test_kit`, written with the entry in one transaction. */
export const testKitService = perContext((ctx: AppContext) => {
  const { models, sequelize, events, config } = ctx
  const include = [
    { association: 'author', attributes: ['id', 'name'] },
    { association: 'revisions', attributes: ['id'] },
  ]

  function toRows(entryId: number, tankId: number, input: TestKitEntryInput, takenAt: Date): ReadingRow[] {
    const fields: Record<string, string> = {}
    const rows: ReadingRow[] = []
    input.values.forEach((v, i) => {
      const stated = withEntryContext(v, input.values)
      if (!stated.ok) {
        fields[`values.${i}.unit`] = stated.reason
        return
      }
      const checked = checkReading({ ...stated.value, time: takenAt.toISOString() }, config.readingLimits)
      if (!checked.ok) fields[`values.${i}.value`] = checked.reason
      else rows.push({ sourceKey: sourceKey(entryId), metric: checked.metric, time: checked.time, tankId, value: checked.value, source: 'test_kit' })
    })
    if (Object.keys(fields).length) throw badRequest(Object.values(fields)[0], fields)
    return rows
  }

  function present(entry: TestKitEntry): PublicTestKitEntry {
    return {
      id: entry.id,
      tankId: entry.tankId,
      takenAt: entry.takenAt.toISOString(),
      values: entry.values,
      notes: entry.notes,
      enteredBy: { id: entry.author?.id ?? 0, name: entry.author?.name ?? 'former user' },
      editableUntil: new Date(entry.createdAt.getTime() + TEST_KIT_EDIT_WINDOW_HOURS * 3600_000).toISOString(),
      revisions: (entry as TestKitEntry & { revisions?: unknown[] }).revisions?.length ?? 0,
      createdAt: entry.createdAt.toISOString(),
    }
  }

  async function findOwn(actor: UserActor, id: number) {
    const entry = await models.TestKitEntry.findOne({ where: { id, organizationId: actor.organizationId, deletedAt: null }, include })
    if (!entry) throw notFound('Test-kit entry not found')
    await visibleTank(ctx, actor, entry.tankId)
    if (entry.enteredBy !== actor.userId) throw forbidden('Only the keeper who made an entry may change it')
    if (Date.now() > entry.createdAt.getTime() + TEST_KIT_EDIT_WINDOW_HOURS * 3600_000) {
      throw forbidden(`Entries can be changed for ${TEST_KIT_EDIT_WINDOW_HOURS} hours after they are made`)
    }
    return entry
  }

  /** The entry an earlier send with the same phone-made id stored, answered as it was then. */
  async function sentBefore(actor: UserActor, tankId: number, clientId: string | undefined) {
    if (!clientId) return null
    const entry = await models.TestKitEntry.findOne({ where: { organizationId: actor.organizationId, clientId }, include })
    if (!entry) return null
    if (entry.tankId !== tankId)
      throw conflict('client_id_reused', 'clientId: this id belongs to an entry of another tank', { clientId: 'already used for another entry' })
    const rows = toRows(entry.id, entry.tankId, { values: entry.values, notes: entry.notes }, entry.takenAt)
    return { ...present(entry), probeChecks: await probeChecksFor(ctx, entry.tankId, rows) }
  }

  const snapshot = (e: TestKitEntry) => ({ takenAt: e.takenAt.toISOString(), values: e.values, notes: e.notes })

  return {
    async list(actor: UserActor, tankId: number, range: { from?: Date; to?: Date } = {}) {
      await visibleTank(ctx, actor, tankId)
      const where: Record<string | symbol, unknown> = { tankId, deletedAt: null }
      if (range.from || range.to) {
        where.takenAt = { ...(range.from ? { [Op.gte]: range.from } : {}), ...(range.to ? { [Op.lt]: range.to } : {}) }
      }
      const entries = await models.TestKitEntry.findAll({ where, include, order: [['takenAt', 'DESC']], limit: 500 })
      return entries.map(present)
    },

    async create(actor: UserActor, tankId: number, input: TestKitEntryInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const earlier = await sentBefore(actor, tank.id, input.clientId)
      if (earlier) return earlier
      // A phone offline since before the tank was archived keeps the refused entry with this reason.
      if (tank.archivedAt) throw conflict('tank_archived', 'This tank is archived; restore it before recording a test-kit entry')
      const takenAt = input.takenAt ? new Date(input.takenAt) : new Date()
      toRows(0, tank.id, input, takenAt) // validate before anything is written
      const { clientId = null } = input
      const written = await sequelize
        .transaction(async (transaction) => {
          const entry = await models.TestKitEntry.create(
            { organizationId: actor.organizationId, tankId: tank.id, enteredBy: actor.userId, takenAt, values: input.values, notes: input.notes, clientId },
            { transaction },
          )
          const stored = await insertReadings(sequelize, toRows(entry.id, tank.id, input, takenAt), transaction)
          return { entry, stored }
        })
        .catch(async (error: unknown) => {
          // The same entry sent twice at once: the other send stored it.
          if (error instanceof UniqueConstraintError && clientId) return sentBefore(actor, tank.id, clientId)
          throw error
        })
      if (!written) throw conflict('conflict', 'Another request made the same change at the same moment; reload to see it')
      if (!('entry' in written)) return written
      const { entry, stored } = written
      events.emit('readings.stored', stored)
      await entry.reload({ include })
      return { ...present(entry), probeChecks: await probeChecksFor(ctx, tank.id, stored) }
    },

    async update(actor: UserActor, id: number, input: TestKitEntryInput) {
      const entry = await findOwn(actor, id)
      const takenAt = input.takenAt ? new Date(input.takenAt) : entry.takenAt
      const rows = toRows(entry.id, entry.tankId, input, takenAt)
      const stored = await sequelize.transaction(async (transaction) => {
        await models.TestKitEntryRevision.create({ entryId: entry.id, action: 'edit', changedBy: actor.userId, snapshot: snapshot(entry) }, { transaction })
        await deleteReadingsOfSource(sequelize, sourceKey(entry.id), transaction)
        await entry.update({ takenAt, values: input.values, notes: input.notes }, { transaction })
        return insertReadings(sequelize, rows, transaction)
      })
      events.emit('readings.stored', stored)
      await entry.reload({ include })
      return { ...present(entry), probeChecks: await probeChecksFor(ctx, entry.tankId, stored) }
    },

    async remove(actor: UserActor, id: number) {
      const entry = await findOwn(actor, id)
      await sequelize.transaction(async (transaction) => {
        await models.TestKitEntryRevision.create({ entryId: entry.id, action: 'delete', changedBy: actor.userId, snapshot: snapshot(entry) }, { transaction })
        await deleteReadingsOfSource(sequelize, sourceKey(entry.id), transaction)
        await entry.update({ deletedAt: new Date() }, { transaction })
      })
    },

    /** The entry's story: what it said before each edit or deletion. */
    async history(actor: UserActor, id: number) {
      const entry = await models.TestKitEntry.findOne({ where: { id, organizationId: actor.organizationId } })
      if (!entry) throw notFound('Test-kit entry not found')
      await visibleTank(ctx, actor, entry.tankId)
      const revisions = await models.TestKitEntryRevision.findAll({ where: { entryId: id }, order: [['createdAt', 'ASC']] })
      return {
        current: entry.deletedAt ? null : snapshot(entry),
        deletedAt: entry.deletedAt?.toISOString() ?? null,
        revisions: revisions.map((r) => ({ action: r.action, changedBy: r.changedBy, at: r.createdAt.toISOString(), before: r.snapshot })),
      }
    },
  }
})
