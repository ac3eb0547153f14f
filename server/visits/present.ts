import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { PublicVisit, VisitDueTask } from '@shared/schemas/visits'
import type { AppContext } from '../context'
import { dueItems } from '../care'
import type { Visit } from '../models'

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

/** The local calendar day of an instant on a site's clock, `YYYY-MM-DD`. */
export const localDay = (timeZone: string, at: Date | number) => formatLocalDate(localDateAt(timeZone, typeof at === 'number' ? at : at.getTime()))

/** Visits with their client, site, technician and tank names, as the API answers them. */
export async function presentVisits(ctx: AppContext, visits: Visit[], now = new Date()): Promise<PublicVisit[]> {
  const tankIds = [...new Set(visits.flatMap((v) => v.tankIds))]
  const tanks = tankIds.length ? await ctx.models.Tank.findAll({ where: { id: tankIds }, attributes: ['id', 'name'] }) : []
  const names = new Map(tanks.map((t) => [t.id, t.name]))
  return visits.map((v) => {
    const timeZone = v.site?.timeZone ?? 'UTC'
    return {
      id: v.id,
      clientId: v.clientId,
      clientName: v.client?.name ?? '',
      siteId: v.siteId,
      siteName: v.site?.name ?? '',
      siteAddress: v.site?.address ?? '',
      timeZone,
      technician: { id: v.technicianId, name: v.technician?.name ?? 'former user' },
      startsAt: v.startsAt.toISOString(),
      endsAt: v.endsAt.toISOString(),
      tanks: v.tankIds.map((id) => ({ id, name: names.get(id) ?? 'removed tank' })),
      state: v.state,
      arrivedAt: iso(v.arrivedAt),
      leftAt: iso(v.leftAt),
      notes: v.notes,
      materials: v.materials,
      work: v.work,
      photoIds: v.photoIds,
      closedAt: iso(v.closedAt),
      overdue: v.state !== 'closed' && localDay(timeZone, v.endsAt) < localDay(timeZone, now),
    }
  })
}

/** Care due at the visit's tanks by the end of the coming days: the checklist on the phone and the round's list. */
export async function dueAt(ctx: AppContext, tankIds: number[], now: Date): Promise<VisitDueTask[]> {
  const items = await dueItems(ctx, { tankIds }, now)
  return items
    .filter((i) => !i.due.snoozed && i.due.status !== 'later')
    .map(({ task, due }) => ({
      id: task.id,
      tankId: task.tankId,
      title: task.title,
      status: due.status,
      dueDate: due.dueOn,
      lastDoneAt: iso(task.lastDoneAt),
    }))
}
