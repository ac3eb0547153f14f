import { Op, type Order, type WhereOptions } from 'sequelize'
import { grossVolumeLitres } from '@shared/chemistry/volume'
import { defaultTargetsFor } from '@shared/schemas/tank-defaults'
import { tankInputSchema, type TankInput, type TankListQuery, type TankUpdate } from '@shared/schemas/tanks'
import type { Page } from '@shared/schemas/common'
import type { TankListItem } from '@shared/schemas/tanks'
import type { Actor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, fromZod } from '../platform/errors'
import { canSeeSite, siteFilter, tankScope, visibleTank } from '../access/scope'
import { tankStatuses } from './tank-status'
import { perContext } from '../platform/per-context'
import type { Tank } from '../models'
import type { PublicTank } from '@shared/schemas/tanks'

const SORT_COLUMNS: Record<TankListQuery['sortBy'], Order> = {
  name: [['name', 'ASC']],
  site: [['name', 'ASC']], // replaced by the site-name order in list()
  kind: [
    ['kind', 'ASC'],
    ['name', 'ASC'],
  ],
  stage: [
    ['stage', 'ASC'],
    ['name', 'ASC'],
  ],
  volume: [
    ['volumeLitres', 'ASC'],
    ['name', 'ASC'],
  ],
  updated: [
    ['updatedAt', 'ASC'],
    ['name', 'ASC'],
  ],
}

function withDirection(order: Order, desc: boolean): Order {
  if (!desc || !Array.isArray(order)) return order
  return order.map((part) => {
    const items = [...(part as unknown[])]
    items[items.length - 1] = 'DESC'
    return items
  }) as Order
}

/** Geometry the schema lets through but the formula refuses (a bow deeper than half the length) is bad input, not a 500. */
function volumeFromDimensions(dimensions: NonNullable<TankInput['dimensions']>) {
  let litres: number
  try {
    litres = Math.round(grossVolumeLitres(dimensions) * 10) / 10
  } catch (error) {
    if (!(error instanceof RangeError)) throw error
    const field = `dimensions.${/^\w+/.exec(error.message)?.[0] ?? 'shape'}`
    throw badRequest(`${field}: ${error.message}`, { [field]: error.message })
  }
  // Stored to 0.1 L, and the table refuses a volume of zero.
  if (litres <= 0) throw badRequest('dimensions: holds less than 0.05 L', { dimensions: 'holds less than 0.05 L' })
  return litres
}

/** The stored volume: computed from inside dimensions when given, else the entered figure. */
function volumeOf(input: Pick<TankInput, 'dimensions' | 'volumeLitres'>) {
  if (input.dimensions) {
    return { volumeLitres: volumeFromDimensions(input.dimensions), volumeSource: 'dimensions' as const }
  }
  return { volumeLitres: input.volumeLitres as number, volumeSource: 'entered' as const }
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

/** The row as the API answers it (see its Public… type in shared/schemas). */
export function presentTank(tank: Tank): PublicTank {
  return {
    id: tank.id,
    name: tank.name,
    siteId: tank.siteId,
    siteName: tank.site?.name ?? '',
    clientId: tank.clientId ?? null,
    clientName: tank.client?.name ?? null,
    kind: tank.kind,
    stage: tank.stage,
    dimensions: tank.dimensions,
    volumeLitres: tank.volumeLitres,
    volumeSource: tank.volumeSource,
    substrateDepthCm: tank.substrateDepthCm,
    heater: tank.heater,
    filter: tank.filter,
    media: tank.media,
    lightSchedule: tank.lightSchedule,
    targets: tank.targets,
    notes: tank.notes,
    sortOrder: tank.sortOrder,
    archivedAt: iso(tank.archivedAt),
    createdAt: tank.createdAt.toISOString(),
    updatedAt: tank.updatedAt.toISOString(),
  }
}

export const tanksService = perContext((ctx: AppContext) => {
  const { models } = ctx
  const include = [
    { association: 'site', attributes: ['id', 'name', 'timeZone'] },
    { association: 'client', attributes: ['id', 'name'] },
  ]

  const find = (actor: Actor, id: number) => visibleTank(ctx, actor, id)

  async function assertSiteUsable(actor: Actor, siteId: number) {
    const site = await models.Site.findByPk(siteId)
    if (!canSeeSite(actor, site)) throw badRequest('siteId: no such site', { siteId: 'no such site' })
    if (site!.archivedAt) throw badRequest('siteId: the site is archived', { siteId: 'the site is archived' })
  }

  async function assertClientUsable(actor: Actor, clientId: number | null | undefined) {
    if (!clientId) return
    const client = await models.Client.findOne({ where: { id: clientId, organizationId: actor.organizationId, archivedAt: null } })
    if (!client) throw badRequest('clientId: no such client', { clientId: 'no such client' })
  }

  return {
    find,

    /** A page of tanks, each with its state, latest values and open incidents. */
    async list(actor: Actor, q: TankListQuery): Promise<Page<TankListItem>> {
      const where: Record<string | symbol, unknown> = { ...(tankScope(actor) as object) }
      if (!q.includeArchived) where.archivedAt = null
      if (q.siteId) where.siteId = siteFilter(actor, q.siteId)
      if (q.clientId) where.clientId = q.clientId
      if (q.stage) where.stage = q.stage
      if (q.kind) where.kind = q.kind
      if (q.search) {
        const like = `%${q.search.replace(/[\\%_]/g, (c) => `\\${c}`)}%`
        where[Op.or] = [{ name: { [Op.iLike]: like } }, { notes: { [Op.iLike]: like } }]
      }
      const order =
        q.sortBy === 'site'
          ? ([
              [{ model: models.Site, as: 'site' }, 'name', q.sortDesc ? 'DESC' : 'ASC'],
              ['name', 'ASC'],
            ] as Order)
          : withDirection(SORT_COLUMNS[q.sortBy], q.sortDesc)
      const { rows, count } = await models.Tank.findAndCountAll({
        where: where as WhereOptions,
        include,
        order,
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      })
      const statuses = await tankStatuses(ctx, rows)
      const items = rows.map((tank) => ({ ...presentTank(tank), status: statuses.get(tank.id)! }))
      return { items, total: count, page: q.page, pageSize: q.pageSize }
    },

    async get(actor: Actor, id: number) {
      return presentTank(await find(actor, id))
    },

    async create(actor: Actor, input: TankInput) {
      await assertSiteUsable(actor, input.siteId)
      await assertClientUsable(actor, input.clientId)
      const tank = await models.Tank.create({
        ...input,
        ...volumeOf(input),
        targets: input.targets ?? defaultTargetsFor(input.kind),
        organizationId: actor.organizationId,
      })
      await ctx.events.settle('tank.created', tank)
      return presentTank(await find(actor, tank.id))
    },

    async update(actor: Actor, id: number, changes: TankUpdate) {
      const tank = await find(actor, id)
      const current = presentTank(tank)
      // Validate the merged tank so cross-field rules (volume known, heater inside the tank) still hold.
      const merged = tankInputSchema.safeParse({ ...current, ...changes })
      if (!merged.success) throw fromZod(merged.error, 'body')
      if (changes.siteId && changes.siteId !== tank.siteId) await assertSiteUsable(actor, changes.siteId)
      if (changes.clientId && changes.clientId !== tank.clientId) await assertClientUsable(actor, changes.clientId)
      const next = merged.data
      const stageChanges = next.stage !== tank.stage
      await ctx.sequelize.transaction(async (transaction) => {
        await tank.update({ ...next, ...volumeOf(next), targets: next.targets ?? tank.targets }, { transaction })
        // The quarantine clock starts here; the column belongs to care, the Tank model does not declare it.
        if (stageChanges) await ctx.sequelize.query('UPDATE tanks SET stage_changed_at = now() WHERE id = $1', { bind: [tank.id], transaction })
      })
      // A client's people see exactly the client's tanks: their open sockets follow the change.
      if (next.clientId !== current.clientId) ctx.events.emit('access.changed', { organizationId: tank.organizationId })
      return presentTank(await find(actor, id))
    },

    async setArchived(actor: Actor, id: number, archived: boolean) {
      const tank = await find(actor, id)
      await tank.update({ archivedAt: archived ? new Date() : null })
      if (archived) {
        // An archived tank takes no readings: its connected devices are cut as if revoked, and live sockets stop showing it.
        const devices = await ctx.models.Device.findAll({ where: { tankId: tank.id }, attributes: ['id'] })
        for (const device of devices) ctx.events.emit('device.revoked', { deviceId: device.id })
      }
      ctx.events.emit('access.changed', { organizationId: tank.organizationId })
      return presentTank(tank)
    },
  }
})
