import { Op, QueryTypes, type Transaction } from 'sequelize'
import { METRICS, isMetricKey } from '@shared/metrics/registry'
import type { AppContext } from '../context'
import { enqueueMail } from '../mail/outbox'
import {
  ELECTRICAL_SAFETY_CAUTION, TREND_CID, deviceBack, incidentEscalated, incidentOpened, incidentRepeat, incidentResolved, type IncidentMailInput,
} from '../mail/templates'
import { renderTrendPng } from '../mail/trend-chart'
import type { Incident } from '../models'
import { ackLinksService } from '../services/ack-links'
import { dutyRecipients } from '../services/roster'
import type { IncidentNotifier, NotifyKind } from './notifier'
import { needsElectricalCaution, whatToCheck } from './what-to-check'

type Person = { userId: number | null; name: string; email: string }

const TEMPLATES = { opened: incidentOpened, escalated: incidentEscalated, repeated: incidentRepeat, resolved: incidentResolved }
const MAIL_KIND = { opened: 'incident_opened', escalated: 'incident_escalated', repeated: 'incident_repeat', resolved: 'incident_resolved' } as const

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
    return rows.map((r) => {
      const u = users.find((x) => x.email === r.to_address)
      return { userId: u?.id ?? null, name: u?.name ?? r.to_address, email: r.to_address }
    })
  }

  async function recipients(kind: NotifyKind, incident: Incident, transaction: Transaction): Promise<Person[]> {
    if (kind === 'resolved') return alreadyTold(incident.id, transaction)
    const duty = (await dutyRecipients(ctx, incident.siteId)).map((d) => ({ userId: d.userId, name: d.name, email: d.email }))
    const list = kind === 'opened' ? duty : [...duty, ...(await owners(incident.organizationId, transaction))]
    return [...new Map(list.map((p) => [p.email, p])).values()]
  }

  async function trend(incident: Incident, transaction: Transaction) {
    const rows = await sequelize.query<{ time: Date; value: number }>(
      `SELECT time, value FROM readings WHERE tank_id = $1 AND metric = $2 AND time >= $3 ORDER BY time LIMIT 5000`,
      { bind: [incident.tankId, incident.metric, new Date(Date.now() - 6 * 3600_000)], type: QueryTypes.SELECT, transaction },
    )
    return rows.map((r) => [r.time.getTime(), r.value] as [number, number])
  }

  return {
    async notify(kind, incident, transaction) {
      const people = await recipients(kind, incident, transaction)
      if (!people.length) return []
      const [tank, site, organization] = await Promise.all([
        models.Tank.findByPk(incident.tankId, { transaction }),
        models.Site.findByPk(incident.siteId, { transaction }),
        models.Organization.findByPk(incident.organizationId, { transaction }),
      ])
      const rule = incident.ruleId ? await models.WatchRule.findByPk(incident.ruleId, { transaction }) : null
      const def = isMetricKey(incident.metric) ? METRICS[incident.metric] : null
      const points = await trend(incident, transaction)
      const band = tank?.targets?.[incident.metric as keyof typeof tank.targets]
      const trendPng = points.length > 1
        ? await renderTrendPng({ points, band: band ?? undefined, title: `${def?.label ?? incident.metric}, last 6 h`, unitLabel: def?.unitLabel ?? '', timeZone: site?.timeZone ?? 'UTC' })
        : undefined
      const serial = kind === 'escalated' ? `level-${incident.escalationLevel}` : kind === 'repeated' ? (incident.nextRepeatAt?.toISOString() ?? String(Date.now())) : 'once'
      for (const person of people) {
        const acknowledgeUrl = kind !== 'resolved' && person.userId ? await ackLinksService(ctx).create(incident.id, person.userId, transaction) : undefined
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
          whatToCheck: rule ? whatToCheck(rule.spec, incident.metric) : [],
          incidentUrl: `${config.publicUrl}/incidents/${incident.id}`,
          acknowledgeUrl,
          trendPng,
          safetyCaution: rule && needsElectricalCaution(rule.spec, incident.metric) ? ELECTRICAL_SAFETY_CAUTION : undefined,
          at: kind === 'opened' ? undefined : new Date().toISOString(),
        }
        // A quiet sensor that reports again is news of its own: "back", not just "resolved".
        const backOnline = kind === 'resolved' && incident.ruleKind === 'quiet'
        const mail = backOnline ? deviceBack(input) : TEMPLATES[kind](input)
        await enqueueMail(
          ctx,
          {
            kind: backOnline ? 'device_back' : MAIL_KIND[kind], to: person.email, subject: mail.subject, text: mail.text, html: mail.html, attachments: mail.attachments,
            organizationId: incident.organizationId, incidentId: incident.id, dedupeKey: `incident:${incident.id}:${kind}:${serial}:${person.email}`,
          },
          { transaction },
        )
      }
      return people.map((p) => p.email)
    },
  }
}
export { TREND_CID }
