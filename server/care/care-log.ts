import { Op, type Transaction } from 'sequelize'
import type { CareValues } from '@shared/care/defaults'
import type { CareLogInput, CareLogKind } from '@shared/schemas/care'
import type { PublicCareLogEntry } from '@shared/schemas/care-api'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest } from '../platform/errors'
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
      const entry = await writeCareLog(ctx, {
        organizationId: actor.organizationId,
        tankId: tank.id,
        kind: input.kind,
        at: instantNotAhead(input.at, 'at'),
        userId: actor.userId,
        text: input.text,
        values: input.values,
      })
      return (await presentCareLog(ctx, [entry]))[0] as PublicCareLogEntry
    },
  }
})
