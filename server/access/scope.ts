import { Op, type WhereOptions } from 'sequelize'
import type { Actor } from './actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'

/** Rows an actor may see: always its own organization, and for a limited viewer only its sites. */
export function siteScope(actor: Actor, siteColumn: 'id' | 'siteId'): WhereOptions {
  const where: Record<string | symbol, unknown> = { organizationId: actor.organizationId }
  if (actor.siteIds) where[siteColumn] = { [Op.in]: actor.siteIds }
  return where as WhereOptions
}

export function canSeeSite(actor: Actor, site: { organizationId: number; id: number } | null): boolean {
  if (!site || site.organizationId !== actor.organizationId) return false
  return !actor.siteIds || actor.siteIds.includes(site.id)
}

/** Another organization's row answers 404, never 403: its existence is not ours to reveal. */
export function mustSee<T extends { organizationId: number }>(row: T | null, actor: Actor, what: string): T {
  if (!row || row.organizationId !== actor.organizationId) throw notFound(`${what} not found`)
  return row
}

/** The tank with its site, if the actor may see it; else 404. Every feature checks tank access here. */
export async function visibleTank(ctx: AppContext, actor: Actor, id: number) {
  const tank = await ctx.models.Tank.findOne({
    where: { id, ...siteScope(actor, 'siteId') },
    include: [{ association: 'site', attributes: ['id', 'name', 'timeZone'] }],
  })
  if (!tank) throw notFound('Tank not found')
  return tank
}
