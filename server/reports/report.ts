import { reportPeriod, type ReportPeriod, type ReportPeriodKind } from '@shared/report/period'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { Report, ReportQuery } from '@shared/schemas/reports'
import type { Actor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { Client, Site, Tank } from '../models'
import { tankReport } from './report-data'
import { sitesService } from '../sites'
import { clockStyleOf } from '../people'
import { tankScope, visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

export type ReportSubject =
  | { kind: 'tank'; tank: Tank; site: Site }
  | { kind: 'site'; site: Site; tanks: Tank[] }
  /** A client's tanks across their sites; `site` is the first one, whose clock the report keeps. */
  | { kind: 'client'; client: Client; site: Site; tanks: Tank[] }
export type ReportKind = ReportSubject['kind']
export type ReportTarget = { tankId: number | null; siteId: number | null; clientId?: number | null }

/** The period of `kind` holding `date`, or holding today on the site's calendar. */
export function periodFor(kind: ReportPeriodKind, date: string | undefined, timeZone: string, now: Date): ReportPeriod {
  return reportPeriod(kind, date ?? formatLocalDate(localDateAt(timeZone, now.getTime())), timeZone)
}

/** Builds a report with no actor: the caller has already decided the subject may be seen. */
export async function buildReport(ctx: AppContext, subject: ReportSubject, period: ReportPeriod, now = new Date()): Promise<Report> {
  if (period.from >= now.getTime()) throw badRequest('date: this period has not started yet', { date: 'this period has not started yet' })
  const to = Math.min(period.to, now.getTime())
  const tanks = subject.kind === 'tank' ? [subject.tank] : subject.tanks
  const reports = []
  for (const tank of tanks) reports.push(await tankReport(ctx, tank, period, to))
  const { site } = subject
  const clockStyle = await clockStyleOf(ctx, site.organizationId)
  return {
    subject:
      subject.kind === 'tank'
        ? { kind: 'tank', id: subject.tank.id, name: subject.tank.name, siteId: site.id, siteName: site.name, timeZone: site.timeZone, clockStyle }
        : subject.kind === 'client'
          ? { kind: 'client', id: subject.client.id, name: subject.client.name, siteId: site.id, siteName: site.name, timeZone: site.timeZone, clockStyle }
          : { kind: 'site', id: site.id, name: site.name, siteId: site.id, siteName: site.name, timeZone: site.timeZone, clockStyle },
    period: {
      kind: period.kind,
      label: period.label,
      startDate: period.startDate,
      endDate: period.endDate,
      from: new Date(period.from).toISOString(),
      to: new Date(period.to).toISOString(),
      previousDate: period.previousDate,
      nextDate: period.nextDate,
      inProgress: period.to > now.getTime(),
    },
    generatedAt: now.toISOString(),
    tanks: reports,
  }
}

/** The subject with its live tanks, found without an actor (the schedule job). */
export async function loadSubject(ctx: AppContext, target: ReportTarget): Promise<ReportSubject | null> {
  const { models } = ctx
  if (target.clientId) {
    const client = await models.Client.findByPk(target.clientId)
    return client && !client.archivedAt ? clientSubject(ctx, client, { clientId: client.id }) : null
  }
  if (target.tankId !== null) {
    const tank = await models.Tank.findByPk(target.tankId)
    const site = tank ? await models.Site.findByPk(tank.siteId) : null
    return tank && site && !tank.archivedAt ? { kind: 'tank', tank, site } : null
  }
  const site = target.siteId !== null ? await models.Site.findByPk(target.siteId) : null
  if (!site || site.archivedAt) return null
  const tanks = await models.Tank.findAll({
    where: { siteId: site.id, archivedAt: null },
    order: [
      ['sortOrder', 'ASC'],
      ['name', 'ASC'],
    ],
  })
  return { kind: 'site', site, tanks }
}

/** A client's live tanks (within `where`, the caller's scope), ordered by site then name. */
async function clientSubject(ctx: AppContext, client: Client, where: object): Promise<ReportSubject | null> {
  const tanks = await ctx.models.Tank.findAll({
    where: { ...where, clientId: client.id, archivedAt: null },
    include: [{ association: 'site' }],
    order: [
      [{ model: ctx.models.Site, as: 'site' }, 'name', 'ASC'],
      ['sortOrder', 'ASC'],
      ['name', 'ASC'],
    ],
  })
  const site = tanks[0]?.site ?? null
  return site ? { kind: 'client', client, site, tanks } : null
}

export const reportService = perContext((ctx: AppContext) => {
  const sites = sitesService(ctx)

  /** A tank or a site the actor may see (404 otherwise, as everywhere). */
  async function subjectFor(actor: Actor, kind: ReportKind, id: number): Promise<ReportSubject> {
    if (kind === 'client') {
      const client = await ctx.models.Client.findOne({ where: { id, organizationId: actor.organizationId } })
      // A client's page is for the business and for that client's own people; a site's viewer has none.
      const mayAsk = actor.kind === 'user' && (actor.tankIds ? actor.clientId === id : !actor.siteIds)
      const subject = client && mayAsk ? await clientSubject(ctx, client, tankScope(actor)) : null
      if (!subject) throw notFound('Client not found')
      return subject
    }
    if (kind === 'tank') {
      const tank = await visibleTank(ctx, actor, id)
      const site = (await ctx.models.Site.findByPk(tank.siteId))!
      return { kind: 'tank', tank, site }
    }
    const site = await sites.find(actor, id)
    return (await loadSubject(ctx, { tankId: null, siteId: site.id })) ?? { kind: 'site', site, tanks: [] }
  }

  return {
    subjectFor,
    async report(actor: Actor, kind: ReportKind, id: number, query: ReportQuery, now = new Date()) {
      const subject = await subjectFor(actor, kind, id)
      return buildReport(ctx, subject, periodFor(query.period, query.date, subject.site.timeZone, now), now)
    },
  }
})
