import type { Transaction } from 'sequelize'
import type { ConsumableAlert, ConsumableInput, ConsumableUpdate, PublicConsumable } from '@shared/schemas/equipment'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import { siteScope } from '../access/scope'
import type { AppContext } from '../context'
import type { CareTask, Consumable } from '../models'
import { badRequest, notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import { sitesService } from '../sites'

const todayIn = (timeZone: string, now: Date) => formatLocalDate(localDateAt(timeZone, now.getTime()))

function present(c: Consumable, today: string): PublicConsumable {
  return {
    id: c.id,
    siteId: c.siteId,
    kind: c.kind,
    name: c.name,
    unit: c.unit,
    quantity: c.quantity,
    lowAt: c.lowAt ?? null,
    expiresOn: c.expiresOn ?? null,
    notes: c.notes,
    low: c.lowAt !== null && c.lowAt !== undefined && c.quantity <= c.lowAt,
    // A reagent is good through its expiry date and spent the day after.
    expired: c.expiresOn !== null && c.expiresOn !== undefined && c.expiresOn < today,
  }
}

/** Low or expired consumables at these sites (already scoped by the caller), by site then name. */
export async function consumableAlerts(ctx: AppContext, siteIds: number[], now = new Date()): Promise<ConsumableAlert[]> {
  if (!siteIds.length) return []
  const sites = await ctx.models.Site.findAll({ where: { id: siteIds }, attributes: ['id', 'name', 'timeZone'], order: [['name', 'ASC']] })
  const rows = await ctx.models.Consumable.findAll({ where: { siteId: siteIds }, order: [['name', 'ASC']] })
  return sites.flatMap((site) =>
    rows
      .filter((r) => r.siteId === site.id)
      .map((r) => present(r, todayIn(site.timeZone, now)))
      .filter((c) => c.low || c.expired)
      .map((c) => ({ ...c, site: { id: site.id, name: site.name } })),
  )
}

/** What a done care task uses up, taken from its consumable's stock (never below zero). */
export async function drawDown(ctx: AppContext, task: CareTask, transaction?: Transaction) {
  if (!task.consumableId || !task.consumableAmount) return
  await ctx.models.Consumable.update(
    { quantity: ctx.sequelize.literal(`GREATEST(0, quantity - ${Number(task.consumableAmount)})`) as unknown as number },
    { where: { id: task.consumableId }, transaction },
  )
}

/** Checks that a care task on a tank at `siteId` may name this consumable: one of the same site. */
export async function checkTaskConsumable(ctx: AppContext, siteId: number, consumableId: number | null | undefined, amount: number | null | undefined) {
  if (consumableId === undefined || consumableId === null) return
  const found = await ctx.models.Consumable.findOne({ where: { id: consumableId, siteId }, attributes: ['id'] })
  if (!found) throw badRequest("consumableId: not a consumable of this tank's site", { consumableId: "not a consumable of this tank's site" })
  if (!amount) throw badRequest('consumableAmount: say how much each time uses', { consumableAmount: 'say how much each time uses' })
}

export const consumablesService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function findVisible(actor: UserActor, id: number) {
    const row = await models.Consumable.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!row) throw notFound('Consumable not found')
    const site = await models.Site.findOne({ where: { id: row.siteId, ...siteScope(actor, 'id') }, attributes: ['id', 'timeZone'] })
    if (!site) throw notFound('Consumable not found')
    return { row, site }
  }

  return {
    async list(actor: UserActor, siteId: number, now = new Date()): Promise<PublicConsumable[]> {
      const site = await sitesService(ctx).find(actor, siteId)
      const rows = await models.Consumable.findAll({
        where: { siteId: site.id },
        order: [
          ['kind', 'ASC'],
          ['name', 'ASC'],
        ],
      })
      const today = todayIn(site.timeZone, now)
      return rows.map((r) => present(r, today))
    },

    async create(actor: UserActor, siteId: number, input: ConsumableInput): Promise<PublicConsumable> {
      const site = await sitesService(ctx).find(actor, siteId)
      const row = await models.Consumable.create({ ...input, organizationId: actor.organizationId, siteId: site.id })
      return present(row, todayIn(site.timeZone, new Date()))
    },

    async update(actor: UserActor, id: number, changes: ConsumableUpdate): Promise<PublicConsumable> {
      const { row, site } = await findVisible(actor, id)
      await row.update(changes)
      return present(row, todayIn(site.timeZone, new Date()))
    },
  }
})
