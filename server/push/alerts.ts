import type { Transaction } from 'sequelize'
import type { AlertChannel, AlertChannels, PushPayload } from '@shared/schemas/push'
import type { ClockStyle } from '@shared/schemas/auth'
import { formatZonedDateTime } from '@shared/time'
import type { AppContext } from '../context'
import { DEFAULT_CHANNELS } from './devices'
import { enqueuePush, type OutgoingPush } from './outbox'

type Severity = 'warning' | 'alarm'
export type IncidentPushKind = 'opened' | 'escalated' | 'repeated' | 'resolved' | 'raised' | 'reopened' | 'resolver'

export type IncidentPushInput = {
  incidentId: number
  severity: Severity
  tankName: string
  siteName: string
  /** What is wrong, in words: "temperature 29.6 °C, above 28 °C" (shared/rules/measurement). */
  what: string
  metricLabel: string
  /** When it started (ISO). */
  since: string
  siteTimeZone: string
  clockStyle?: ClockStyle
  /** The single-use acknowledge token of this person's alert (none for the all-clear). */
  ackToken?: string
}

const SEVERITY = { warning: 'Warning', alarm: 'Alarm' } as const
const one = (s: string) => s.replace(/\s+/g, ' ').trim()
/** Capital first letter, except a metric that keeps its own case (pH). */
const sentence = (s: string) => (s.startsWith('pH') ? s : s.charAt(0).toUpperCase() + s.slice(1))

const TITLES: Record<IncidentPushKind, (i: IncidentPushInput) => string> = {
  opened: (i) => `${SEVERITY[i.severity]}: ${i.tankName}`,
  escalated: (i) => `Escalated ${SEVERITY[i.severity].toLowerCase()}: ${i.tankName}`,
  repeated: (i) => `Still open — ${SEVERITY[i.severity].toLowerCase()}: ${i.tankName}`,
  resolved: (i) => `Resolved: ${i.tankName}`,
  raised: (i) => `Now ${SEVERITY[i.severity].toLowerCase()}: ${i.tankName}`,
  reopened: (i) => `Back and holding — ${SEVERITY[i.severity].toLowerCase()}: ${i.tankName}`,
  resolver: (i) => `Reopened after you resolved it: ${i.tankName}`,
}

/**
 * A phone notification: the tank in the title; what is wrong and since when in the body, on the
 * site's clock; tapping it opens the incident. Alerts with something to do carry the token of the
 * Acknowledge action; the all-clear does not.
 */
export function incidentPush(kind: IncidentPushKind, i: IncidentPushInput): PushPayload {
  const since = formatZonedDateTime(i.since, i.siteTimeZone, i.clockStyle)
  const body =
    kind === 'resolved'
      ? `${i.metricLabel} is back in range (opened ${since}) · ${i.siteName}`
      : kind === 'escalated'
        ? `Nobody has acknowledged it: ${i.what}, since ${since} · ${i.siteName}`
        : `${i.what}, since ${since} · ${i.siteName}`
  return {
    title: one(TITLES[kind](i)),
    body: one(sentence(body)),
    tag: `incident-${i.incidentId}`,
    url: `/incidents/${i.incidentId}`,
    incidentId: i.incidentId,
    severity: i.severity,
    ...(kind !== 'resolved' && i.ackToken ? { ackToken: i.ackToken } : {}),
  }
}

const wantsMail = (channel: AlertChannel) => channel !== 'phone'
const wantsPhone = (channel: AlertChannel) => channel !== 'mail'

/** Each person's channel for a severity; people who never chose get mail. */
export async function alertChannelsOf(
  ctx: Pick<AppContext, 'models'>,
  userIds: number[],
  severity: Severity,
  transaction?: Transaction,
): Promise<Map<number, AlertChannel>> {
  const rows = userIds.length ? await ctx.models.AlertChannelChoice.findAll({ where: { userId: userIds }, transaction }) : []
  const chosen = new Map(rows.map((r) => [r.userId, { warning: r.warning, alarm: r.alarm } satisfies AlertChannels]))
  return new Map(userIds.map((id) => [id, (chosen.get(id) ?? DEFAULT_CHANNELS)[severity]]))
}

export type SitePushInput = {
  siteIncidentId: number
  siteId: number
  severity: Severity
  siteName: string
  /** One line per tank: "Reef display: temperature 29.6 °C, above 28 °C". */
  tanks: string[]
  openedAt: string
  siteTimeZone: string
  clockStyle?: ClockStyle
  escalated: boolean
}

/** One notification for a site-wide fault, in place of each tank's own; it opens the site's incidents. */
export function sitePush(i: SitePushInput): PushPayload {
  const count = i.tanks.length === 1 ? '1 tank' : `${i.tanks.length} tanks`
  const body = `Since ${formatZonedDateTime(i.openedAt, i.siteTimeZone, i.clockStyle)}: ${i.tanks.join('; ')}`
  return {
    title: one(`${i.escalated ? 'Escalated — ' : ''}${SEVERITY[i.severity]}: ${count} at ${i.siteName} at once`),
    body: one(body).slice(0, 400),
    tag: `site-incident-${i.siteIncidentId}`,
    url: `/incidents?siteId=${i.siteId}`,
    severity: i.severity,
  }
}

/**
 * Pushes an alert to a person who chose the phone for its severity. Answers whether their mail is
 * still due: yes unless they chose the phone alone and have a device that can show it.
 */
export async function pushAlert(
  ctx: Pick<AppContext, 'sequelize'>,
  userId: number | null,
  channel: AlertChannel,
  push: Omit<OutgoingPush, 'kind' | 'userId'>,
  transaction: Transaction,
): Promise<{ mailToo: boolean }> {
  if (!userId || !wantsPhone(channel)) return { mailToo: true }
  const devices = await enqueuePush(ctx, { ...push, kind: 'incident', userId }, { transaction })
  return { mailToo: wantsMail(channel) || devices === 0 }
}

/** Who was told, for the incident's timeline: the address, and how when not by mail alone. */
export function toldWord(email: string, channel: AlertChannel, mailToo: boolean): string {
  if (channel === 'mail' || (channel === 'phone' && mailToo)) return email
  return channel === 'both' && mailToo ? `${email} (mail and phone)` : `${email} (phone)`
}
