import { fn, col } from 'sequelize'
import type { SiteInput } from '@shared/schemas/sites'
import type { Actor } from '../access/actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import { canSeeSite, siteScope } from '../access/scope'
import { perContext } from '../platform/per-context'
import type { Site } from '../models'
import type { PublicSite } from '@shared/schemas/sites'

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

/** The row as the API answers it (see its Public… type in shared/schemas). */
function presentSite(site: Site, tankCount = 0): PublicSite {
  return {
    id: site.id,
    name: site.name,
    timeZone: site.timeZone,
    address: site.address,
    notes: site.notes,
    workdayEnd: site.workdayEnd ?? null,
    archivedAt: iso(site.archivedAt),
    tankCount,
  }
}

export const sitesService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function find(actor: Actor, id: number) {
    const site = await models.Site.findByPk(id)
    if (!site || !canSeeSite(actor, site)) throw notFound('Site not found')
    return site
  }

  async function tankCounts(siteIds: number[]) {
    if (!siteIds.length) return new Map<number, number>()
    const rows = (await models.Tank.findAll({
      attributes: ['siteId', [fn('count', col('id')), 'count']],
      where: { siteId: siteIds, archivedAt: null },
      group: ['siteId'],
      raw: true,
    })) as unknown as Array<{ siteId: number; count: number }>
    return new Map(rows.map((r) => [r.siteId, Number(r.count)]))
  }

  return {
    find,

    async list(actor: Actor, includeArchived: boolean) {
      const where = { ...siteScope(actor, 'id'), ...(includeArchived ? {} : { archivedAt: null }) }
      const sites = await models.Site.findAll({ where, order: [['name', 'ASC']] })
      const counts = await tankCounts(sites.map((s) => s.id))
      return sites.map((s) => presentSite(s, counts.get(s.id) ?? 0))
    },

    async get(actor: Actor, id: number) {
      const site = await find(actor, id)
      return presentSite(site, (await tankCounts([id])).get(id) ?? 0)
    },

    async create(actor: Actor, input: SiteInput) {
      const site = await models.Site.create({ ...input, organizationId: actor.organizationId })
      return presentSite(site)
    },

    async update(actor: Actor, id: number, input: Partial<SiteInput>) {
      const site = await find(actor, id)
      await site.update(input)
      return presentSite(site, (await tankCounts([id])).get(id) ?? 0)
    },

    async setArchived(actor: Actor, id: number, archived: boolean) {
      const site = await find(actor, id)
      await site.update({ archivedAt: archived ? new Date() : null })
      ctx.events.emit('access.changed', { organizationId: site.organizationId })
      return presentSite(site, (await tankCounts([id])).get(id) ?? 0)
    },
  }
})
