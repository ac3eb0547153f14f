import { QueryTypes } from 'sequelize'
import { stringify } from 'csv-stringify/sync'
import { guardRow } from '@shared/csv/formula-guard'
import { speciesByKey } from '@shared/care/species'
import type { StockQuery, StockRow } from '@shared/schemas/livestock'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { perContext } from '../platform/per-context'
import { sitesService } from '../sites'

type Row = { tankId: number; tankName: string; siteId: number; siteName: string; speciesKey: string | null; name: string; batches: number; alive: number }

const GROUP_WORDS = { tank: 'tank', site: 'site', species: 'species' } as const

/** Animals in the tanks now (plants left out), per tank, per site or per species. */
export const stockService = perContext((ctx: AppContext) => {
  async function counts(actor: UserActor, query: StockQuery): Promise<StockRow[]> {
    if (query.siteId) await sitesService(ctx).find(actor, query.siteId)
    const siteIds = query.siteId ? [query.siteId] : actor.siteIds
    const rows = await ctx.sequelize.query<Row>(
      `SELECT t.id AS "tankId", t.name AS "tankName", s.id AS "siteId", s.name AS "siteName", l.species_key AS "speciesKey", l.name,
              count(*)::int AS batches, sum(l.count - l.losses - l.moved_out)::int AS alive
       FROM livestock l JOIN tanks t ON t.id = l.tank_id JOIN sites s ON s.id = t.site_id
       WHERE l.organization_id = :org AND l.removed_at IS NULL AND l.category <> 'plant' AND l.count - l.losses - l.moved_out > 0
         AND t.archived_at IS NULL AND s.archived_at IS NULL ${siteIds ? 'AND s.id IN (:siteIds)' : ''}
       GROUP BY t.id, t.name, s.id, s.name, l.species_key, l.name`,
      { type: QueryTypes.SELECT, replacements: { org: actor.organizationId, siteIds: siteIds?.length ? siteIds : [0] } },
    )
    const groups = new Map<string, StockRow>()
    for (const r of rows) {
      const species = r.speciesKey ?? `name:${r.name.toLowerCase()}`
      const key = query.by === 'tank' ? `tank:${r.tankId}` : query.by === 'site' ? `site:${r.siteId}` : `species:${species}`
      const row = groups.get(key) ?? {
        key,
        label: query.by === 'tank' ? r.tankName : query.by === 'site' ? r.siteName : ((r.speciesKey && speciesByKey(r.speciesKey)?.commonName) ?? r.name),
        site: query.by === 'species' ? null : { id: r.siteId, name: r.siteName },
        tank: query.by === 'tank' ? { id: r.tankId, name: r.tankName } : null,
        speciesKey: query.by === 'species' ? r.speciesKey : null,
        batches: 0,
        alive: 0,
      }
      row.batches += r.batches
      row.alive += r.alive
      groups.set(key, row)
    }
    return [...groups.values()].sort((a, b) => (a.site?.name ?? '').localeCompare(b.site?.name ?? '') || a.label.localeCompare(b.label))
  }

  async function csv(actor: UserActor, query: StockQuery): Promise<{ fileName: string; body: string }> {
    const rows = await counts(actor, query)
    const header =
      query.by === 'species' ? ['species', 'batches', 'animals'] : query.by === 'site' ? ['site', 'batches', 'animals'] : ['site', 'tank', 'batches', 'animals']
    const lines = rows.map((r) => (query.by === 'tank' ? [r.site?.name ?? '', r.label, r.batches, r.alive] : [r.label, r.batches, r.alive]))
    return { fileName: `stock-by-${GROUP_WORDS[query.by]}.csv`, body: stringify([header, ...lines.map(guardRow)], { record_delimiter: 'windows' }) }
  }

  return { counts, csv }
})
