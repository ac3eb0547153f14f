import { Op } from 'sequelize'
import { lastEndedPeriod, nextReportSend, type ReportPeriod } from '@shared/report/period'
import type { ReportSchedule as PublicSchedule, ReportScheduleInput, ReportScheduleUpdate } from '@shared/schemas/reports'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import { enqueueMail } from '../mail'
import type { ReportSchedule, Site, User } from '../models'
import { reportMail } from './mail'
import { renderReportPdf } from './pdf'
import { buildReport, loadSubject, reportService, type ReportTarget } from './report'
import { perContext } from '../platform/per-context'

/** Whether a person may receive the report of a subject: a client's people only their client's, a site's viewer only their site's. */
function canSee(user: User, subject: { siteId: number; clientId: number | null }) {
  if (user.role !== 'viewer') return true
  if (user.clientId) return user.clientId === subject.clientId
  if (!user.sites?.length) return true
  return subject.clientId === null && user.sites.some((s) => s.id === subject.siteId)
}

/** Addresses a schedule sends to: its own plus active users of the organization who may see the site. */
export async function recipientsOf(ctx: AppContext, schedule: ReportSchedule, siteId: number): Promise<string[]> {
  const subject = { siteId, clientId: schedule.clientId ?? null }
  const users = schedule.userIds.length
    ? await ctx.models.User.findAll({
        where: { id: { [Op.in]: schedule.userIds }, organizationId: schedule.organizationId, active: true },
        include: [{ association: 'sites', attributes: ['id'] }],
      })
    : []
  const all = [...schedule.emails, ...users.filter((u) => canSee(u, subject)).map((u) => u.email)]
  return [...new Set(all.map((a) => a.trim().toLowerCase()))]
}

async function siteOf(ctx: AppContext, schedule: ReportTarget): Promise<Site | null> {
  if (schedule.clientId) return (await loadSubject(ctx, schedule))?.site ?? null
  if (schedule.siteId !== null) return ctx.models.Site.findByPk(schedule.siteId)
  const tank = schedule.tankId !== null ? await ctx.models.Tank.findByPk(schedule.tankId) : null
  return tank ? ctx.models.Site.findByPk(tank.siteId) : null
}

export function reportLink(ctx: AppContext, target: ReportTarget, period: ReportPeriod) {
  const subject = target.clientId ? `client=${target.clientId}` : target.tankId !== null ? `tank=${target.tankId}` : `site=${target.siteId}`
  return new URL(`/reports?${subject}&period=${period.kind}&date=${period.startDate}`, ctx.config.publicUrl).toString()
}

/**
 * Renders the report of `period` and puts one mail per recipient in the outbox. `claim` marks
 * the period sent in the same transaction, and only if no one else has: a period goes out once
 * even with several instances. Answers how many mails were queued.
 */
export async function sendScheduledReport(
  ctx: AppContext,
  schedule: ReportSchedule,
  period: ReportPeriod,
  options: { claim: boolean; dedupeSuffix: string; now?: Date },
): Promise<number> {
  const subject = await loadSubject(ctx, schedule)
  if (!subject) return 0
  const report = await buildReport(ctx, subject, period, options.now)
  const recipients = await recipientsOf(ctx, schedule, subject.site.id)
  const pdf = await renderReportPdf(report)
  const mail = reportMail(report, pdf, reportLink(ctx, schedule, period))
  return ctx.sequelize.transaction(async (transaction) => {
    if (options.claim) {
      const [claimed] = await ctx.models.ReportSchedule.update(
        { lastSentPeriod: period.startDate },
        { where: { id: schedule.id, [Op.or]: [{ lastSentPeriod: null }, { lastSentPeriod: { [Op.ne]: period.startDate } }] }, transaction },
      )
      if (!claimed) return 0
    }
    let queued = 0
    for (const to of recipients) {
      const id = await enqueueMail(
        ctx,
        {
          kind: 'report',
          to,
          ...mail,
          organizationId: schedule.organizationId,
          dedupeKey: `report:${schedule.id}:${period.kind}:${period.startDate}:${options.dedupeSuffix}:${to}`,
        },
        { transaction },
      )
      if (id !== null) queued++
    }
    return queued
  })
}

function present(s: ReportSchedule, names: Map<string, string>): PublicSchedule {
  return {
    id: s.id,
    tankId: s.tankId,
    siteId: s.siteId,
    clientId: s.clientId ?? null,
    subjectName: names.get(s.clientId ? `c${s.clientId}` : s.tankId !== null ? `t${s.tankId}` : `s${s.siteId}`) ?? '',
    period: s.period,
    emails: s.emails,
    userIds: s.userIds,
    enabled: s.enabled,
    lastSentPeriod: s.lastSentPeriod,
    createdAt: s.createdAt.toISOString(),
  }
}

export const reportSchedulesService = perContext((ctx: AppContext) => {
  const { models } = ctx
  const reports = reportService(ctx)

  async function names(rows: ReportSchedule[]) {
    const tankIds = rows.map((r) => r.tankId).filter((v): v is number => v !== null)
    const siteIds = rows.map((r) => r.siteId).filter((v): v is number => v !== null)
    const tanks = tankIds.length ? await models.Tank.findAll({ where: { id: tankIds }, attributes: ['id', 'name'] }) : []
    const sites = siteIds.length ? await models.Site.findAll({ where: { id: siteIds }, attributes: ['id', 'name'] }) : []
    const clientIds = rows.map((r) => r.clientId).filter((v): v is number => !!v)
    const clients = clientIds.length ? await models.Client.findAll({ where: { id: clientIds }, attributes: ['id', 'name'] }) : []
    return new Map([
      ...tanks.map((t) => [`t${t.id}`, t.name] as const),
      ...sites.map((s) => [`s${s.id}`, s.name] as const),
      ...clients.map((c) => [`c${c.id}`, c.name] as const),
    ])
  }

  async function find(actor: UserActor, id: number) {
    const row = await models.ReportSchedule.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!row) throw notFound('Report schedule not found')
    return row
  }

  async function assertUsers(actor: UserActor, userIds: number[], subject: { siteId: number; clientId: number | null }) {
    if (!userIds.length) return
    const users = await models.User.findAll({
      where: { id: { [Op.in]: userIds }, organizationId: actor.organizationId, active: true },
      include: [{ association: 'sites', attributes: ['id'] }],
    })
    const usable = new Set(users.filter((u) => canSee(u, subject)).map((u) => u.id))
    const bad = userIds.filter((id) => !usable.has(id))
    if (bad.length)
      throw badRequest(`userIds: ${bad.join(', ')} cannot receive this report (unknown, inactive, or without access to the site)`, {
        userIds: 'unknown, inactive, or without access to the site',
      })
  }

  return {
    async list(actor: UserActor) {
      const rows = await models.ReportSchedule.findAll({ where: { organizationId: actor.organizationId }, order: [['id', 'ASC']] })
      const map = await names(rows)
      return rows.map((r) => present(r, map))
    },

    async create(actor: UserActor, input: ReportScheduleInput, now = new Date()) {
      const kind = input.clientId !== null ? 'client' : input.tankId !== null ? 'tank' : 'site'
      const field = `${kind}Id`
      const subject = await reports.subjectFor(actor, kind, (input.clientId ?? input.tankId ?? input.siteId)!).catch(() => {
        // A client's report needs at least one live tank to keep its calendar.
        const message = kind === 'client' ? 'no such client, or it has no tanks' : `no such ${kind}`
        throw badRequest(`${field}: ${message}`, { [field]: message })
      })
      await assertUsers(actor, input.userIds, { siteId: subject.site.id, clientId: input.clientId })
      // A schedule made after this period's send time starts with the next period, not a late send:
      // the ended period is marked as sent.
      const ended = nextReportSend(input.period, null, now.getTime(), subject.site.timeZone)
      const row = await models.ReportSchedule.create({
        organizationId: actor.organizationId,
        tankId: input.tankId,
        siteId: input.siteId,
        clientId: input.clientId,
        period: input.period,
        emails: input.emails,
        userIds: input.userIds,
        enabled: input.enabled,
        createdBy: actor.userId,
        lastSentPeriod: ended.at <= now.getTime() ? ended.period.startDate : null,
      })
      return present(row, await names([row]))
    },

    async update(actor: UserActor, id: number, changes: Partial<ReportScheduleUpdate>) {
      const row = await find(actor, id)
      const site = await siteOf(ctx, row)
      if (changes.userIds && site) await assertUsers(actor, changes.userIds, { siteId: site.id, clientId: row.clientId ?? null })
      const emails = changes.emails ?? row.emails
      const userIds = changes.userIds ?? row.userIds
      if (!emails.length && !userIds.length) throw badRequest('emails: add at least one recipient', { emails: 'add at least one recipient' })
      await row.update(changes)
      return present(row, await names([row]))
    },

    async remove(actor: UserActor, id: number) {
      await (await find(actor, id)).destroy()
    },

    /** Sends the last ended period's report now, whether or not it already went out. */
    async sendNow(actor: UserActor, id: number, now = new Date()) {
      const row = await find(actor, id)
      const site = await siteOf(ctx, row)
      if (!site) throw notFound('Report schedule not found')
      const period = lastEndedPeriod(row.period, now.getTime(), site.timeZone)
      // One press per minute: a double click sends once.
      const queued = await sendScheduledReport(ctx, row, period, { claim: false, dedupeSuffix: `now-${Math.floor(now.getTime() / 60_000)}`, now })
      return { queued, period: { kind: period.kind, startDate: period.startDate, endDate: period.endDate, label: period.label } }
    },
  }
})
