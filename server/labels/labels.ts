import type { LabelSheetQuery } from '@shared/schemas/labels'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { perContext } from '../platform/per-context'
import { sitesService } from '../sites'
import { renderLabelsPdf, type TankLabel } from './pdf'
import { tankLabelLink } from './qr'

/** A printable sheet of a site's tank labels: name and a QR code opening the tank's test-kit entry. */
export const labelsService = perContext((ctx: AppContext) => ({
  async sheet(actor: UserActor, siteId: number, query: LabelSheetQuery, options: { compress?: boolean } = {}) {
    const site = await sitesService(ctx).find(actor, siteId)
    // Archived tanks get no new labels; an old label of one still opens a page that says so.
    const tanks = await ctx.models.Tank.findAll({ where: { siteId: site.id, archivedAt: null }, attributes: ['id', 'name'], order: [['name', 'ASC']] })
    const labels: TankLabel[] = tanks.map((t) => ({ name: t.name, siteName: site.name, link: tankLabelLink(ctx.config.publicUrl, t.id) }))
    const pdf = await renderLabelsPdf(labels, { ...query, title: `Tank labels: ${site.name}`, ...options })
    const slug =
      site.name
        .toLowerCase()
        .replace(/[^a-z0-9]+/g, '-')
        .replace(/^-|-$/g, '') || 'site'
    return { pdf, fileName: `tank-labels-${slug}-${query.paper}-${query.size}.pdf`, count: labels.length }
  },
}))
