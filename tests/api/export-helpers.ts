import { QueryTypes } from 'sequelize'
import type { AppContext } from '../../server/context'
import { authService } from '../../server/people/auth'

/** Inserts one row with plain SQL and answers its id; the tests build whole organizations this way. */
export async function insertRow(ctx: AppContext, table: string, values: Record<string, unknown>): Promise<number> {
  const columns = Object.keys(values)
  const rows = (await ctx.sequelize.query(
    `INSERT INTO "${table}" (${columns.map((c) => `"${c}"`).join(', ')}) VALUES (${columns.map((_, i) => `$${i + 1}`).join(', ')}) RETURNING *`,
    { bind: columns.map((c) => values[c]), type: QueryTypes.SELECT },
  )) as Array<{ id?: number }>
  return rows[0]!.id ?? 0
}

export function tankValues(organizationId: number, siteId: number, name: string) {
  return {
    organization_id: organizationId,
    site_id: siteId,
    name,
    kind: 'tropical_freshwater',
    stage: 'established',
    volume_litres: 120,
    volume_source: 'entered',
    targets: JSON.stringify({ temperature: { min: 24, max: 27 } }),
  }
}

/** A reading row as the batch writer stores it. */
export function insertReading(ctx: AppContext, r: { tankId: number; metric: string; time: string; value: number; source: string; sourceKey: string }) {
  return ctx.sequelize.query('INSERT INTO readings (tank_id, metric, time, value, source, source_key) VALUES ($1, $2, $3, $4, $5, $6)', {
    bind: [r.tankId, r.metric, r.time, r.value, r.source, r.sourceKey],
  })
}

/** A person with a signed-in session; a viewer given `siteIds` sees only those sites. */
export async function signedInUser(ctx: AppContext, organizationId: number, role: 'owner' | 'keeper' | 'viewer', email: string, siteIds: number[] = []) {
  const user = await ctx.models.User.create({ organizationId, email, name: `${role} ${email.split('@')[0]}`, role, passwordHash: 'x' })
  for (const siteId of siteIds) await insertRow(ctx, 'user_sites', { user_id: user.id, site_id: siteId })
  await user.reload({ include: [{ association: 'sites' }] })
  const session = await authService(ctx).openSession(user)
  return { id: user.id, token: session.token }
}
