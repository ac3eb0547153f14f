import { Op, QueryTypes, type Transaction } from 'sequelize'
import { METRICS, isMetricKey } from '@shared/metrics/registry'
import type { AppContext } from '../context'
import { enqueueMail } from '../mail'
import { describeMeasurement } from '@shared/rules/measurement'
import {
  ELECTRICAL_SAFETY_CAUTION,
  TREND_CID,
  deviceBack,
  incidentEscalated,
  incidentOpened,
  incidentRaised,
  incidentReopened,
  incidentReopenedToResolver,
  incidentRepeat,
  incidentResolved,
  type IncidentMailInput,
} from '../mail'
import { SITE_FIRST_STEPS, siteIncidentMail } from '../mail'
import { renderTrendPng } from '../mail'
import type { Incident, SiteIncident } from '../models'
import { ackLinksService } from './ack-links'
import { dutyRecipients } from '../roster'
import type { IncidentNotifier, NotifyKind, NotifyOptions } from './notifier'
import { firstStep, needsElectricalCaution, whatToCheck } from './what-to-check'
import { recentValues } from '../readings'
import { heaterAge } from '../equipment'
import { alertChannelsOf, incidentPush, pushAlert, pushedUserIds, sitePush, toldWord } from '../push'

type Person = { userId: number | null; name: string; email: string }

const TEMPLATES = {
  opened: incidentOpened,
  escalated: incidentEscalated,
  repeated: incidentRepeat,
  resolved: incidentResolved,
  raised: incidentRaised,
  reopened: incidentReopened,
  resolver: incidentReopenedToResolver,
}
const MAIL_KIND = {
  opened: 'incident_opened',
  escalated: 'incident_escalated',
  repeated: 'incident_repeat',
  resolved: 'incident_resolved',
  raised: 'incident_raised',
  reopened: 'incident_reopened',
  resolver: 'incident_reopened',
} as const

/**
 * Alert mails: on open, whoever is on duty (or the backup); escalations and repeats add the backup
 * and the owners; the all-clear goes to everyone who was told. Written to the outbox in the
 * incident's own transaction.
 */
export function createMailNotifier(ctx: AppContext): IncidentNotifier {
  const { models, sequelize, config } = ctx

  async function owners(organizationId: number, transaction: Transaction): Promise<Person[]> {
    const rows = await models.User.findAll({ where: { organizationId, role: 'owner', active: true }, transaction })
    return rows.map((u) => ({ userId: u.id, name: u.name, email: u.email }))
  }

  async function alreadyTold(incidentId: number, transaction: Transaction): Promise<Person[]> {
    const rows = await sequelize.query<{ to_address: string }>(
      `SELECT DISTINCT to_address FROM mail_outbox WHERE incident_id = $1 AND kind <> 'incident_resolved'`,
      { bind: [incidentId], type: QueryTypes.SELECT, transaction },
    )
    const users = await models.User.findAll({ where: { email: { [Op.in]: rows.map((r) => r.to_address) } }, transaction })
    const mailed = rows.map((r) => {
      const u = users.find((x) => x.email === r.to_address)
      return { userId: u?.id ?? null, name: u?.name ?? r.to_address, email: r.to_address }
    })
    // People who chose the phone alone were told without a mail.
    const pushedIds = (await pushedUserIds(ctx, incidentId, transaction)).filter((id) => !mailed.some((p) => p.userId === id))
    const pushed = pushedIds.length ? await models.User.findAll({ where: { id: pushedIds }, transaction }) : []
    return [...mailed, ...pushed.map((u) => ({ userId: u.id, name: u.name, email: u.email }))]
  }

  async function recipients(kind: NotifyKind, incident: Incident, transaction: Transaction, options: NotifyOptions): Promise<Person[]> {
    if (kind === 'resolved') return alreadyTold(incident.id, transaction)
    if (kind === 'resolver') {
      const user = options.userId ? await models.User.findByPk(options.userId, { transaction }) : null
      return user?.active ? [{ userId: user.id, name: user.name, email: user.email }] : []
    }
    const duty = (await dutyRecipients(ctx, incident.siteId)).map((d) => ({ userId: d.userId, name: d.name, email: d.email }))
    // A rise in severity or a flap that held goes to whoever is on duty and whoever was told before.
    const list =
      kind === 'opened'
        ? duty
        : kind === 'raised' || kind === 'reopened'
          ? [...duty, ...(await alreadyTold(incident.id, transaction))]
          : [...duty, ...(await owners(incident.organizationId, transaction))]
    return [...new Map(list.map((p) => [p.email, p])).values()]
  }

  async function trend(incident: Incident, transaction: Transaction) {
    const rows = await recentValues(sequelize, incident.tankId, incident.metric, new Date(Date.now() - 6 * 3600_000), transaction)
    return rows.map((r) => [r.time.getTime(), r.value] as [number, number])
  }

  return {
    async notify(kind, incident, transaction, options = {}) {
      const people = await recipients(kind, incident, transaction, options)
      if (!people.length) return []
      // One after another: queries on one transaction's connection cannot run at once.
      const tank = await models.Tank.findByPk(incident.tankId, { transaction })
      const site = await models.Site.findByPk(incident.siteId, { transaction })
      const organization = await models.Organization.findByPk(incident.organizationId, { transaction })
      const rule = incident.ruleId ? await models.WatchRule.findByPk(incident.ruleId, { transaction }) : null
      const def = isMetricKey(incident.metric) ? METRICS[incident.metric] : null
      const points = await trend(incident, transaction)
      const band = tank?.targets?.[incident.metric as keyof typeof tank.targets]
      const trendPng =
        points.length > 1
          ? await renderTrendPng({
              points,
              band: band ?? undefined,
              title: `${def?.label ?? incident.metric}, last 6 h`,
              window: { from: Date.now() - 6 * 3600_000, to: Date.now() },
              unitLabel: def?.unitLabel ?? '',
              timeZone: site?.timeZone ?? 'UTC',
              clockStyle: organization?.clockStyle,
            })
          : undefined
      const serial =
        kind === 'escalated'
          ? `level-${incident.escalationLevel}`
          : kind === 'repeated'
            ? (incident.nextRepeatAt?.toISOString() ?? String(Date.now()))
            : kind === 'raised'
              ? incident.severity
              : kind === 'reopened' || kind === 'resolver'
                ? `flap-${incident.flapCount}-${Date.now()}`
                : options.afterMaintenance
                  ? 'after-maintenance'
                  : 'once'
      const measurement = describeMeasurement({
        spec: rule?.spec ?? null,
        metric: incident.metric,
        value: incident.latestValue ?? incident.firstValue,
        heaterTopCm: tank?.heater?.topCm,
      })
      const heater = incident.metric === 'temperature' && tank ? await heaterAge(ctx, tank.id, new Date(), transaction) : null
      const channels = await alertChannelsOf(
        ctx,
        people.flatMap((p) => (p.userId ? [p.userId] : [])),
        incident.severity,
        transaction,
      )
      const told: string[] = []
      for (const person of people) {
        const acknowledgeUrl = kind !== 'resolved' && person.userId ? await ackLinksService(ctx).create(incident.id, person.userId, transaction) : undefined
        const channel = person.userId ? (channels.get(person.userId) ?? 'mail') : 'mail'
        const { mailToo } = await pushAlert(
          ctx,
          person.userId,
          channel,
          {
            organizationId: incident.organizationId,
            incidentId: incident.id,
            urgency: incident.severity === 'alarm' && kind !== 'resolved' ? 'high' : 'normal',
            dedupeKey: `incident:${incident.id}:${kind}:${serial}:user:${person.userId}`,
            payload: incidentPush(kind, {
              incidentId: incident.id,
              severity: incident.severity,
              tankName: tank?.name ?? '',
              siteName: site?.name ?? '',
              what: measurement,
              metricLabel: def?.label ?? incident.metric,
              since: incident.openedAt.toISOString(),
              siteTimeZone: site?.timeZone ?? 'UTC',
              clockStyle: organization?.clockStyle,
              ackToken: acknowledgeUrl ? (new URL(acknowledgeUrl).searchParams.get('token') ?? undefined) : undefined,
            }),
          },
          transaction,
        )
        told.push(toldWord(person.email, channel, mailToo))
        if (!mailToo) continue
        const input: IncidentMailInput = {
          organizationName: organization?.name ?? '',
          siteName: site?.name ?? '',
          tankName: tank?.name ?? '',
          ruleName: incident.title,
          severity: incident.severity,
          metricLabel: def?.label ?? incident.metric,
          value: incident.latestValue ?? incident.firstValue ?? '—',
          unitLabel: def?.unitLabel ?? '',
          since: incident.openedAt.toISOString(),
          siteTimeZone: site?.timeZone ?? 'UTC',
          clockStyle: organization?.clockStyle,
          whatToCheck: rule ? whatToCheck(rule.spec, incident.metric) : [],
          incidentUrl: `${config.publicUrl}/incidents/${incident.id}`,
          acknowledgeUrl,
          trendPng,
          safetyCaution: rule && needsElectricalCaution(rule.spec, incident.metric) ? ELECTRICAL_SAFETY_CAUTION : undefined,
          at: kind === 'opened' ? undefined : new Date().toISOString(),
          measurement,
          heater: heater?.text,
          firstStep: rule ? firstStep(rule.spec, incident.metric, incident.latestValue) : undefined,
          note: options.afterMaintenance
            ? 'It opened during a maintenance window, which has ended while it still holds.'
            : incident.flapCount
              ? `It has cleared and come back ${incident.flapCount} ${incident.flapCount === 1 ? 'time' : 'times'}.`
              : undefined,
        }
        // A quiet sensor that reports again is news of its own: "back", not just "resolved".
        const backOnline = kind === 'resolved' && incident.ruleKind === 'quiet'
        const mail = backOnline ? deviceBack(input) : TEMPLATES[kind](input)
        await enqueueMail(
          ctx,
          {
            kind: backOnline ? 'device_back' : MAIL_KIND[kind],
            to: person.email,
            subject: mail.subject,
            text: mail.text,
            html: mail.html,
            attachments: mail.attachments,
            organizationId: incident.organizationId,
            incidentId: incident.id,
            dedupeKey: `incident:${incident.id}:${kind}:${serial}:${person.email}`,
          },
          { transaction },
        )
      }
      return told
    },

    async notifySite(kind, siteIncident: SiteIncident, transaction) {
      const duty = (await dutyRecipients(ctx, siteIncident.siteId)).map((d) => ({ userId: d.userId, name: d.name, email: d.email }))
      const list = kind === 'opened' ? duty : [...duty, ...(await owners(siteIncident.organizationId, transaction))]
      const people = [...new Map(list.map((p) => [p.email, p])).values()]
      if (!people.length) return []
      const site = await models.Site.findByPk(siteIncident.siteId, { transaction })
      const organization = await models.Organization.findByPk(siteIncident.organizationId, { transaction })
      const linked = await models.Incident.findAll({
        where: { siteIncidentId: siteIncident.id },
        include: [{ association: 'tank', attributes: ['name', 'heater'] }],
        order: [['id', 'ASC']],
        transaction,
      })
      const rules = await models.WatchRule.findAll({ where: { id: linked.map((i) => i.ruleId).filter((id): id is number => id !== null) }, transaction })
      const tanks = linked.map((i) => {
        const tank = (i as Incident & { tank?: { name: string; heater: { topCm: number } | null } }).tank
        const spec = rules.find((r) => r.id === i.ruleId)?.spec ?? null
        return `${tank?.name ?? `Tank ${i.tankId}`}: ${describeMeasurement({ spec, metric: i.metric, value: i.latestValue, heaterTopCm: tank?.heater?.topCm })}`
      })
      const mail = siteIncidentMail({
        organizationName: organization?.name ?? '',
        siteName: site?.name ?? '',
        siteTimeZone: site?.timeZone ?? 'UTC',
        clockStyle: organization?.clockStyle,
        title: siteIncident.title,
        severity: siteIncident.severity,
        tanks,
        firstStep: SITE_FIRST_STEPS[siteIncident.cause] ?? 'First: go and look at the tanks.',
        openedAt: siteIncident.openedAt.toISOString(),
        incidentsUrl: `${config.publicUrl}/incidents?siteId=${siteIncident.siteId}`,
        escalated: kind === 'escalated',
      })
      const channels = await alertChannelsOf(
        ctx,
        people.flatMap((p) => (p.userId ? [p.userId] : [])),
        siteIncident.severity,
        transaction,
      )
      const payload = sitePush({
        siteIncidentId: siteIncident.id,
        siteId: siteIncident.siteId,
        severity: siteIncident.severity,
        siteName: site?.name ?? '',
        tanks,
        openedAt: siteIncident.openedAt.toISOString(),
        siteTimeZone: site?.timeZone ?? 'UTC',
        clockStyle: organization?.clockStyle,
        escalated: kind === 'escalated',
      })
      const told: string[] = []
      for (const person of people) {
        const channel = person.userId ? (channels.get(person.userId) ?? 'mail') : 'mail'
        const push = {
          organizationId: siteIncident.organizationId,
          urgency: siteIncident.severity === 'alarm' ? ('high' as const) : ('normal' as const),
          dedupeKey: `site_incident:${siteIncident.id}:${kind}:${siteIncident.escalationLevel}:user:${person.userId}`,
          payload,
        }
        const { mailToo } = await pushAlert(ctx, person.userId, channel, push, transaction)
        told.push(toldWord(person.email, channel, mailToo))
        if (!mailToo) continue
        await enqueueMail(
          ctx,
          {
            kind: kind === 'opened' ? 'site_incident_opened' : 'site_incident_escalated',
            to: person.email,
            subject: mail.subject,
            text: mail.text,
            html: mail.html,
            organizationId: siteIncident.organizationId,
            incidentId: null,
            dedupeKey: `site_incident:${siteIncident.id}:${kind}:${siteIncident.escalationLevel}:${person.email}`,
          },
          { transaction },
        )
      }
      return told
    },
  }
}
export { TREND_CID }
