import { QueryTypes } from 'sequelize'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'

/** When the tank's stage last changed (its creation time for a tank whose stage never changed). */
export async function stageChangedAt(ctx: AppContext, tankId: number): Promise<Date> {
  const [row] = await ctx.sequelize.query<{ at: Date }>('SELECT stage_changed_at AS at FROM tanks WHERE id = $1', { bind: [tankId], type: QueryTypes.SELECT })
  if (!row) throw notFound('Tank not found')
  return new Date(row.at)
}
