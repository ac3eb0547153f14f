import { QueryTypes } from 'sequelize'
import type { AppContext } from '../server/context'
import { newDeviceToken } from '../server/devices/device-tokens'

/** An organization with one site and `tanks` tanks, each with one device; answers the device tokens. */
export async function benchShop(ctx: AppContext, tanks: number) {
  const org = await ctx.models.Organization.create({ name: `Bench shop ${tanks}` })
  const site = await ctx.models.Site.create({ organizationId: org.id, name: 'Bench floor', timeZone: 'Europe/Berlin' })
  const tankRows = await ctx.sequelize.query<{ id: number }>(
    `INSERT INTO tanks (organization_id, site_id, name, kind, stage, volume_litres, volume_source, targets, heater, sort_order)
     SELECT $1, $2, 'Bench tank ' || g, 'tropical_freshwater', 'established', 100, 'entered',
            '{"temperature":{"min":24,"max":28}}'::jsonb, '{"watts":100,"setPointC":26,"topCm":25}'::jsonb, g
       FROM generate_series(1, $3) g RETURNING id`,
    { bind: [org.id, site.id, tanks], type: QueryTypes.SELECT },
  )
  const devices = await ctx.sequelize.query<{ id: number; tank_id: number }>(
    `INSERT INTO devices (organization_id, tank_id, name, metrics, interval_seconds, token_hash)
     SELECT $1, t, 'Bench node', '{temperature}', 1, 'pending' FROM unnest($2::int[]) t RETURNING id, tank_id`,
    { bind: [org.id, tankRows.map((t) => t.id)], type: QueryTypes.SELECT },
  )
  const tokens = devices.map((d) => ({ deviceId: d.id, tankId: d.tank_id, ...newDeviceToken(d.id) }))
  await ctx.sequelize.query(`UPDATE devices d SET token_hash = u.hash FROM unnest($1::int[], $2::text[]) AS u(id, hash) WHERE d.id = u.id`, {
    bind: [tokens.map((t) => t.deviceId), tokens.map((t) => t.hash)],
  })
  return { organizationId: org.id, siteId: site.id, devices: tokens.map(({ deviceId, tankId, token }) => ({ deviceId, tankId, token })) }
}
