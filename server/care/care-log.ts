import { Op, UniqueConstraintError, type Transaction } from 'sequelize'
import type { CareValues } from '@shared/care/defaults'
import type { CareLogInput, CareLogKind } from '@shared/schemas/care'
import type { PublicCareLogEntry } from '@shared/schemas/care-api'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, conflict } from '../platform/errors'
import type { ReadingLimits } from '../readings'
import type { CareLogEntry } from '../models'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

export type { PublicCareLogEntry }

const MAX_ENTRIES = 1000
/** A care-log entry may be back-dated (written up afterwards) but not dated ahead of now. */
const FUTURE_SLACK_MS = 5 * 60_000

export type CareLogFields = {
  organizationId: number
  tankId: number
  kind: CareLogKind
  at: Date
  userId: number | null
  text?: string
  values?: CareValues
  careTaskId?: number | null
  waterChangeId?: number | null
  clientId?: string | null
}

/** One entry, inside the caller's transaction when there is one. */
export function writeCareLog(ctx: AppContext, fields: CareLogFields, transaction?: Transaction) {
  return ctx.models.CareLogEntry.create(fields, { transaction })
}

export async function presentCareLog(ctx: AppContext, entries: CareLogEntry[]): Promise<PublicCareLogEntry[]> {
  const userIds = [...new Set(entries.map((e) => e.userId).filter((id): id is number => id !== null))]
  const users = userIds.length ? await ctx.models.User.findAll({ attributes: ['id', 'name'], where: { id: userIds } }) : []
  const names = new Map(users.map((u) => [u.id, u.name]))
  return entries.map((e) => ({
    id: e.id,
    tankId: e.tankId,
    kind: e.kind,
    at: e.at.toISOString(),
    by: e.userId === null ? null : { id: e.userId, name: names.get(e.userId) ?? 'former user' },
    text: e.text,
    values: e.values,
    careTaskId: e.careTaskId ?? null,
    waterChangeId: e.waterChangeId ?? null,
  }))
}

export function instantNotAhead(text: string | undefined, field: string, now = new Date()): Date {
  if (!text) return now
  const at = new Date(text)
  if (at.getTime() > now.getTime() + FUTURE_SLACK_MS) throw badRequest(`${field}: cannot be in the future`, { [field]: 'cannot be in the future' })
  return at
}

/**
 * A time a phone took when the entry was made, perhaps hours before it could be sent: held to the
 * same clock limits as readings (a little ahead for a fast clock, not older than the retention age).
 */
export function phoneTime(text: string | undefined, field: string, limits: ReadingLimits, now = new Date()): Date {
  if (!text) return now
  const at = new Date(text)
  if (at.getTime() > now.getTime() + limits.maxFutureSeconds * 1000) {
    throw badRequest(`${field}: more than ${limits.maxFutureSeconds} s in the future (check the phone's clock)`, { [field]: 'cannot be in the future' })
  }
  if (at.getTime() < now.getTime() - limits.maxAgeDays * 86_400_000) {
    throw badRequest(`${field}: older than ${limits.maxAgeDays} days`, { [field]: `older than ${limits.maxAgeDays} days` })
  }
  return at
}

/**
 * The care-log row an earlier send with the same phone-made id wrote, if any. A row of another
 * tank, or of something else than `careTaskId` names, means the id was reused: 409.
 */
export async function loggedBefore(
  ctx: AppContext,
  organizationId: number,
  clientId: string | undefined,
  expect: { tankId: number; careTaskId: number | null },
) {
  if (!clientId) return null
  const entry = await ctx.models.CareLogEntry.findOne({ where: { organizationId, clientId } })
  if (!entry) return null
  if (entry.tankId !== expect.tankId || (entry.careTaskId ?? null) !== expect.careTaskId) {
    throw conflict('client_id_reused', 'clientId: this id belongs to another entry', { clientId: 'already used for another entry' })
  }
  return entry
}

/** True when a write failed only because the same phone-made id was stored meanwhile by another send. */
export const isRepeatedClientId = (error: unknown, clientId: string | undefined) => Boolean(clientId) && error instanceof UniqueConstraintError

/** The care log of a tank: what was done and when, for the tank page and its chart markers. */
export const careLogService = perContext((ctx: AppContext) => {
  return {
    async list(actor: UserActor, tankId: number, range: { from?: string; to?: string }) {
      const tank = await visibleTank(ctx, actor, tankId)
      const at: Record<symbol, Date> = {}
      if (range.from) at[Op.gte] = new Date(range.from)
      if (range.to) at[Op.lt] = new Date(range.to)
      const entries = await ctx.models.CareLogEntry.findAll({
        where: { tankId: tank.id, ...(range.from || range.to ? { at } : {}) },
        order: [
          ['at', 'DESC'],
          ['id', 'DESC'],
        ],
        limit: MAX_ENTRIES,
      })
      return presentCareLog(ctx, entries)
    },

    async create(actor: UserActor, tankId: number, input: CareLogInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const expect = { tankId: tank.id, careTaskId: null }
      const earlier = await loggedBefore(ctx, actor.organizationId, input.clientId, expect)
      if (earlier) return (await presentCareLog(ctx, [earlier]))[0] as PublicCareLogEntry
      const fields = {
        organizationId: actor.organizationId,
        tankId: tank.id,
        kind: input.kind,
        at: phoneTime(input.at, 'at', ctx.config.readingLimits),
        userId: actor.userId,
        text: input.text,
        values: input.values,
        clientId: input.clientId ?? null,
      }
      const entry = await writeCareLog(ctx, fields).catch(async (error: unknown) => {
        const other = isRepeatedClientId(error, input.clientId) ? await loggedBefore(ctx, actor.organizationId, input.clientId, expect) : null
        if (!other) throw error
        return other
      })
      return (await presentCareLog(ctx, [entry]))[0] as PublicCareLogEntry
    },
  }
})
