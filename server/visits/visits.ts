import { Op, type WhereOptions } from 'sequelize'
import { addDays, formatLocalDate, localDateAt, localToInstant, parseLocalDate } from '@shared/time/zoned'
import type { PublicVisit, Round, VisitInput, VisitSheet, VisitUpdate } from '@shared/schemas/visits'
import type { UserActor } from '../access/actor'
import { canSeeSite } from '../access/scope'
import type { AppContext } from '../context'
import { badRequest, conflict, forbidden, notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import type { Visit } from '../models'
import { dueAt, localDay, presentVisits } from './present'

export const VISIT_INCLUDE = [
  { association: 'site', attributes: ['id', 'name', 'timeZone', 'address', 'organizationId'] },
  { association: 'client', attributes: ['id', 'name', 'email'] },
  { association: 'technician', attributes: ['id', 'name', 'email'] },
]

/**
 * Which visits a person may read: staff every visit of the organization; a client's person the
 * client's closed visits; a site's viewer the closed visits at their sites.
 */
export function visitScope(actor: UserActor): WhereOptions {
  const where: Record<string | symbol, unknown> = { organizationId: actor.organizationId }
  if (actor.role !== 'viewer') return where
  where.state = 'closed'
  if (actor.clientId) where.clientId = actor.clientId
  else if (actor.siteIds) where.siteId = { [Op.in]: actor.siteIds }
  return where
}

export const visitsService = perContext((ctx: AppContext) => {
  const { models } = ctx

  async function find(actor: UserActor, id: number) {
    const visit = await models.Visit.findOne({ where: { id, ...visitScope(actor) }, include: VISIT_INCLUDE })
    if (!visit) throw notFound('Visit not found')
    return visit
  }

  /** Staff change a visit; a keeper only one of their own, and nobody a closed one. */
  async function findToWork(actor: UserActor, id: number) {
    const visit = await find(actor, id)
    if (actor.role !== 'owner' && visit.technicianId !== actor.userId) throw forbidden('This visit is on another technician’s round')
    if (visit.state === 'closed') throw conflict('visit_closed', 'This visit is already closed')
    return visit
  }

  /** The client, site, technician and tanks of a planned visit belong together. */
  async function checkPlan(actor: UserActor, plan: Pick<VisitInput, 'clientId' | 'siteId' | 'technicianId' | 'tankIds'>) {
    const client = await models.Client.findOne({ where: { id: plan.clientId, organizationId: actor.organizationId } })
    if (!client) throw badRequest('clientId: no such client', { clientId: 'no such client' })
    const site = await models.Site.findByPk(plan.siteId)
    if (!canSeeSite(actor, site)) throw badRequest('siteId: no such site', { siteId: 'no such site' })
    const technician = await models.User.findOne({ where: { id: plan.technicianId, organizationId: actor.organizationId, active: true } })
    if (!technician || technician.role === 'viewer')
      throw badRequest('technicianId: not an active owner or keeper', { technicianId: 'not an active owner or keeper' })
    const ids = [...new Set(plan.tankIds)]
    const tanks = await models.Tank.count({ where: { id: ids, clientId: client.id, siteId: plan.siteId, archivedAt: null } })
    if (tanks !== ids.length) throw badRequest("tankIds: choose the client's tanks at this site", { tankIds: "choose the client's tanks at this site" })
    return ids
  }

  async function sheet(visit: Visit, now: Date): Promise<VisitSheet> {
    const [publicVisit] = await presentVisits(ctx, [visit], now)
    return { ...publicVisit, due: visit.state === 'closed' ? [] : await dueAt(ctx, visit.tankIds, now) }
  }

  return {
    find,
    findToWork,

    async list(actor: UserActor, q: { clientId?: number; state?: Visit['state'] }, now = new Date()): Promise<PublicVisit[]> {
      const where: Record<string | symbol, unknown> = { ...(visitScope(actor) as object) }
      if (q.clientId) where.clientId = actor.clientId && actor.clientId !== q.clientId ? -1 : q.clientId
      if (q.state && !(actor.role === 'viewer' && q.state !== 'closed')) where.state = q.state
      else if (q.state) where.state = 'none'
      const visits = await models.Visit.findAll({ where, include: VISIT_INCLUDE, order: [['startsAt', 'DESC']], limit: 200 })
      return presentVisits(ctx, visits, now)
    },

    async get(actor: UserActor, id: number, now = new Date()) {
      return sheet(await find(actor, id), now)
    },

    async create(actor: UserActor, input: VisitInput, now = new Date()) {
      const tankIds = await checkPlan(actor, input)
      const visit = await models.Visit.create({
        organizationId: actor.organizationId,
        clientId: input.clientId,
        siteId: input.siteId,
        technicianId: input.technicianId,
        startsAt: new Date(input.startsAt),
        endsAt: new Date(input.endsAt),
        tankIds,
        notes: input.notes,
      })
      return sheet(await find(actor, visit.id), now)
    },

    async update(actor: UserActor, id: number, changes: Partial<VisitUpdate>, now = new Date()) {
      const visit = await findToWork(actor, id)
      const next = {
        clientId: changes.clientId ?? visit.clientId,
        siteId: changes.siteId ?? visit.siteId,
        technicianId: changes.technicianId ?? visit.technicianId,
        tankIds: changes.tankIds ?? visit.tankIds,
      }
      const tankIds = await checkPlan(actor, next)
      const startsAt = changes.startsAt ? new Date(changes.startsAt) : visit.startsAt
      const endsAt = changes.endsAt ? new Date(changes.endsAt) : visit.endsAt
      if (endsAt <= startsAt) throw badRequest('endsAt: must be after the start', { endsAt: 'must be after the start' })
      await visit.update({ ...next, tankIds, startsAt, endsAt, ...(changes.notes !== undefined ? { notes: changes.notes } : {}) })
      return sheet(await find(actor, id), now)
    },

    async remove(actor: UserActor, id: number) {
      const visit = await findToWork(actor, id)
      await visit.destroy()
    },

    /** The technician is on site: the clock starts (once; a second press keeps the first time). */
    async start(actor: UserActor, id: number, now = new Date()) {
      const visit = await findToWork(actor, id)
      if (!visit.arrivedAt) await visit.update({ arrivedAt: now, state: 'started' })
      return sheet(visit, now)
    },

    /**
     * A technician's visits of one local day, in order, with the care due at each stop. The day is
     * on the clock of each visit's site; without a date, today on the first site's clock.
     */
    async round(actor: UserActor, q: { technicianId?: number; date?: string }, now = new Date()): Promise<Round> {
      const technicianId = q.technicianId ?? actor.userId
      if (technicianId !== actor.userId && actor.role !== 'owner') throw forbidden('Only an owner sees another technician’s round')
      const technician = await models.User.findOne({ where: { id: technicianId, organizationId: actor.organizationId } })
      if (!technician) throw badRequest('technicianId: no such person', { technicianId: 'no such person' })
      const firstSite = await models.Site.findOne({ where: { organizationId: actor.organizationId }, order: [['id', 'ASC']] })
      const date = q.date ?? formatLocalDate(localDateAt(firstSite?.timeZone ?? 'UTC', now.getTime()))
      const day = parseLocalDate(date)
      // Wide enough for any zone; each visit is then kept by its own site's calendar.
      const from = new Date(localToInstant('UTC', addDays(day, -1), 0))
      const to = new Date(localToInstant('UTC', addDays(day, 2), 0))
      const visits = await models.Visit.findAll({
        where: { organizationId: actor.organizationId, technicianId, startsAt: { [Op.gte]: from, [Op.lt]: to } },
        include: VISIT_INCLUDE,
        order: [
          ['startsAt', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const ofDay = visits.filter((v) => localDay(v.site?.timeZone ?? 'UTC', v.startsAt) === date)
      const stops: VisitSheet[] = []
      for (const visit of ofDay) stops.push(await sheet(visit, now))
      return { date, technician: { id: technician.id, name: technician.name }, stops }
    },
  }
})

/** Visits at a site still not closed after their day ended on the site's clock, oldest first (for the overview). */
export async function visitsLeftOpen(ctx: AppContext, site: { id: number; timeZone: string }, now: Date) {
  const visits = await ctx.models.Visit.findAll({
    where: { siteId: site.id, state: { [Op.ne]: 'closed' }, endsAt: { [Op.lt]: now } },
    include: VISIT_INCLUDE,
    order: [['startsAt', 'ASC']],
    limit: 50,
  })
  const today = localDay(site.timeZone, now)
  return visits
    .filter((v) => localDay(site.timeZone, v.endsAt) < today)
    .map((v) => ({ id: v.id, clientName: v.client?.name ?? '', technician: v.technician?.name ?? 'former user', startsAt: v.startsAt.toISOString() }))
}
