import { parse as parseCsv } from 'csv-parse/sync'
import { tankInputSchema, type PublicTank } from '@shared/schemas/tanks'
import { tanksFromSheet } from '@shared/tank-import'
import type { UserActor } from '../access/actor'
import { canSeeSite } from '../access/scope'
import type { AppContext } from '../context'
import { badRequest } from '../platform/errors'
import { tanksService } from './tanks'

const squash = (s: string) => s.trim().toLowerCase().replace(/\s+/g, ' ')

/**
 * Tanks from a CSV sheet (name, site, kind, volume, set point). Every row is checked against the
 * sites and their tanks before the first is added, so a sheet with a mistake adds nothing; each tank
 * then gets its kind's rules and care tasks as one made on the form would.
 */
export async function importTanks(ctx: AppContext, actor: UserActor, csv: string): Promise<{ items: PublicTank[] }> {
  let records: string[][]
  try {
    // A spreadsheet saved with a comma as the decimal mark separates with semicolons.
    records = parseCsv(csv, { bom: true, delimiter: [',', ';', '\t'], relax_column_count: true, skip_empty_lines: true, trim: true })
  } catch (error) {
    throw badRequest('csv: not a readable CSV file', { csv: error instanceof Error ? error.message : 'not a readable CSV file' })
  }
  const { rows, errors } = tanksFromSheet(records)
  const sites = (await ctx.models.Site.findAll({ where: { organizationId: actor.organizationId, archivedAt: null } })).filter((s) => canSeeSite(actor, s))
  const siteByName = new Map(sites.map((s) => [squash(s.name), s]))
  const taken = new Set(
    (await ctx.models.Tank.findAll({ where: { siteId: sites.map((s) => s.id), archivedAt: null }, attributes: ['siteId', 'name'] })).map(
      (t) => `${t.siteId}|${squash(t.name)}`,
    ),
  )
  for (const row of rows) {
    const site = siteByName.get(squash(row.siteName))
    if (!site) errors[`row ${row.row}, site`] = `no site named "${row.siteName}"; add it under Sites first`
    else if (taken.has(`${site.id}|${squash(row.name)}`)) errors[`row ${row.row}, name`] = `${site.name} already has a tank named "${row.name}"`
  }
  const problems = Object.entries(errors)
  if (problems.length) throw badRequest(`${problems.length === 1 ? 'A row needs' : `${problems.length} rows need`} fixing; nothing was added`, errors)

  const tanks = tanksService(ctx)
  const items: PublicTank[] = []
  for (const row of rows) {
    const input = tankInputSchema.parse({
      name: row.name,
      siteId: siteByName.get(squash(row.siteName))!.id,
      kind: row.kind,
      stage: 'established',
      volumeLitres: row.volumeLitres,
      heater: row.heater,
    })
    items.push(await tanks.create(actor, input))
  }
  return { items }
}
