import { Op, type WhereOptions } from 'sequelize'
import type { Actor } from './actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'

/**
 * Rows an actor may see: always its own organization, and for a limited viewer only its sites.
 * A client's viewer sees no whole site (`siteIds` is empty), so anything kept per site stays hidden.
 */
export function siteScope(actor: Actor, siteColumn: 'id' | 'siteId'): WhereOptions {
  const where: Record<string | symbol, unknown> = { organizationId: actor.organizationId }
  if (actor.siteIds) where[siteColumn] = { [Op.in]: actor.siteIds }
  return where as WhereOptions
}

/**
 * Tanks an actor may see, as a `where` on the tanks table: a client's viewer exactly the client's
 * tanks, anyone else the tanks of the sites they see. The tank limit sits under `Op.and`, so a
 * caller's own `id` condition beside it narrows it instead of replacing it.
 */
export function tankScope(actor: Actor): WhereOptions {
  if (actor.kind === 'user' && actor.tankIds) {
    return { organizationId: actor.organizationId, [Op.and]: [{ id: { [Op.in]: actor.tankIds } }] } as WhereOptions
  }
  return siteScope(actor, 'siteId')
}

/** A tank filter's site, narrowed to the actor's own: a site the actor may not see matches nothing. */
export function siteFilter(actor: Actor, siteId: number): number {
  if (actor.kind === 'user' && actor.tankIds) return siteId
  return actor.siteIds && !actor.siteIds.includes(siteId) ? -1 : siteId
}

/** Whether the actor sees this tank row (organization, then client's tanks or sites). */
export function canSeeTank(actor: Actor, tank: { organizationId: number; id: number; siteId: number } | null): boolean {
  if (!tank || tank.organizationId !== actor.organizationId) return false
  if (actor.kind === 'user' && actor.tankIds) return actor.tankIds.includes(tank.id)
  return !actor.siteIds || actor.siteIds.includes(tank.siteId)
}

/** Whether the actor sees the whole site: never a client's viewer, who sees single tanks. */
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
    where: { id, ...tankScope(actor) },
    include: [
      { association: 'site', attributes: ['id', 'name', 'timeZone'] },
      { association: 'client', attributes: ['id', 'name'] },
    ],
  })
  if (!tank) throw notFound('Tank not found')
  return tank
}
