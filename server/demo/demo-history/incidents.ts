// Past incidents, written as the incidents service writes a live one: the row, then its timeline
// (opened, mail_queued, escalated, acknowledged, resolved) dated when each step happened.
import { metricOfSpec } from '@shared/rules/kinds'
import type { AppContext } from '../../context'
import { ruleContextFor } from '../../incidents'
import { dutyRecipients } from '../../roster'
import { rulesService } from '../../incidents'
import type { TankHistory } from './readings'
import { replayTrips, type Trip } from './rule-replay'
import type { IncidentNotes } from './story'

type SeedTank = {
  id: number
  name: string
  siteId: number
  organizationId: number
  heater: { topCm: number } | null
  lightSchedule: { on: string; off: string } | null
  timeZone: string
}

/** The engine's timer runs every few seconds; a minute is fine grain for a month gone by. */
const TICK_MS = 60_000
const MINUTE_MS = 60_000
const FALLBACK_NOTE = 'Checked the tank: livestock fine, readings settling. Watching it.'

function notesFor(notes: readonly IncidentNotes[], tank: string, trip: Trip, episodes: ReadonlyArray<{ kind: string; fromMs: number; toMs?: number }>) {
  const during = episodes.find((e) => e.toMs !== undefined && trip.since >= e.fromMs - MINUTE_MS && trip.since <= e.toMs + 3 * 3600_000)
  return notes.find((n) => n.tank === tank && n.episode === during?.kind)
}

export async function seedIncidents(
  ctx: AppContext,
  input: {
    tanks: SeedTank[]
    histories: Map<number, TankHistory>
    episodes: Map<string, ReadonlyArray<{ kind: string; fromMs: number; toMs?: number }>>
    notes: readonly IncidentNotes[]
    fromMs: number
    toMs: number
  },
): Promise<number> {
  const { models, config } = ctx
  const effective = await rulesService(ctx).effectiveRules()
  const owners = await models.User.findAll({ where: { role: 'owner' } })
  const users = new Map((await models.User.findAll()).map((u) => [u.email, u.id]))
  let count = 0
  for (const tank of input.tanks) {
    const history = input.histories.get(tank.id)
    if (!history) continue
    const ruleCtx = ruleContextFor(tank)
    for (const { rule } of effective.filter((e) => e.tankId === tank.id)) {
      const metric = metricOfSpec(rule.spec) as keyof TankHistory['values']
      const values = history.values[metric]
      if (!values) continue
      const trips = replayTrips(rule.spec, { times: history.times, values }, { fromMs: input.fromMs, toMs: input.toMs, tickMs: TICK_MS }, ruleCtx)
      for (const trip of trips) {
        const notes = notesFor(input.notes, tank.name, trip, input.episodes.get(tank.name) ?? [])
        await writeIncident(ctx, {
          tank,
          rule: { id: rule.id, name: rule.name, severity: rule.severity, kind: rule.spec.kind, metric },
          trip,
          notes,
          owners: owners.map((o) => o.email),
          users,
          timing: config.incidentTiming,
        })
        count++
      }
    }
  }
  return count
}

async function writeIncident(
  ctx: AppContext,
  p: {
    tank: SeedTank
    rule: { id: number; name: string; severity: 'warning' | 'alarm'; kind: string; metric: string }
    trip: Trip
    notes: IncidentNotes | undefined
    owners: string[]
    users: Map<string, number>
    timing: { escalateAlarmAfterMinutes: number; escalateWarningAfterMinutes: number }
  },
) {
  const { models, sequelize } = ctx
  const { tank, rule, trip, notes } = p
  const duty = (at: number) => dutyRecipients(ctx, tank.siteId, new Date(at)).then((people) => people.map((d) => d.email))
  const told = await duty(trip.at)
  const ackAt = trip.at + (notes?.ackAfterMs ?? 9 * MINUTE_MS)
  const acknowledged = trip.clearedAt === null || ackAt < trip.clearedAt
  const escalateAt = trip.at + (rule.severity === 'alarm' ? p.timing.escalateAlarmAfterMinutes : p.timing.escalateWarningAfterMinutes) * MINUTE_MS
  const escalated = escalateAt < (acknowledged ? ackAt : (trip.clearedAt ?? Infinity))
  const handAt = notes?.resolveByHand && (trip.clearedAt === null || notes.resolveByHand.at < trip.clearedAt) ? notes.resolveByHand : null
  const resolvedAt = handAt?.at ?? trip.clearedAt
  const acker = told[0] ?? p.owners[0]!
  const events: Array<{ at: number; kind: string; userId?: number | null; detail: Record<string, unknown> }> = [
    { at: trip.at, kind: 'opened', detail: { value: trip.value, since: new Date(trip.since).toISOString(), snoozed: false } },
    { at: trip.at, kind: 'mail_queued', detail: { kind: 'opened', recipients: told } },
  ]
  const escalatedTo = escalated ? [...new Set([...(await duty(escalateAt)), ...p.owners])] : []
  if (escalated) {
    events.push(
      { at: escalateAt, kind: 'escalated', detail: { level: 1 } },
      { at: escalateAt, kind: 'mail_queued', detail: { kind: 'escalated', recipients: escalatedTo } },
    )
  }
  const ackNote = notes?.ackNote ?? FALLBACK_NOTE
  if (acknowledged) events.push({ at: ackAt, kind: 'acknowledged', userId: p.users.get(acker) ?? null, detail: { note: ackNote, via: 'app' } })
  const everyone = [...new Set([...told, ...escalatedTo])]
  if (handAt) {
    events.push({ at: handAt.at, kind: 'resolved', userId: p.users.get(acker) ?? null, detail: { automatic: false, note: handAt.note } })
  } else if (trip.clearedAt !== null) {
    events.push({ at: trip.clearedAt, kind: 'resolved', detail: { automatic: true, value: trip.clearValue, reason: 'The rule cleared' } })
  }
  if (resolvedAt !== null) events.push({ at: resolvedAt, kind: 'mail_queued', detail: { kind: 'resolved', recipients: everyone } })

  await sequelize.transaction(async (transaction) => {
    const incident = await models.Incident.create(
      {
        organizationId: tank.organizationId,
        siteId: tank.siteId,
        tankId: tank.id,
        ruleId: rule.id,
        ruleKind: rule.kind,
        metric: rule.metric,
        severity: rule.severity,
        title: rule.name,
        state: resolvedAt !== null ? 'resolved' : acknowledged ? 'acknowledged' : 'open',
        conditionSince: new Date(trip.since),
        openedAt: new Date(trip.at),
        firstValue: trip.value,
        peakValue: trip.peak,
        latestValue: trip.clearValue ?? trip.latest,
        latestAt: new Date(trip.clearedAt ?? trip.latestAt),
        acknowledgedAt: acknowledged ? new Date(ackAt) : null,
        acknowledgedBy: acknowledged ? (p.users.get(acker) ?? null) : null,
        acknowledgeNote: acknowledged ? ackNote : null,
        resolvedAt: resolvedAt !== null ? new Date(resolvedAt) : null,
        resolvedBy: handAt ? (p.users.get(acker) ?? null) : null,
        resolveNote: handAt ? handAt.note : resolvedAt !== null ? 'The rule cleared' : null,
        escalationLevel: escalated ? 1 : 0,
        nextEscalationAt: null,
        nextRepeatAt: null,
        createdAt: new Date(trip.at),
        updatedAt: new Date(resolvedAt ?? trip.at),
      },
      { transaction, silent: true },
    )
    await models.IncidentEvent.bulkCreate(
      events
        .sort((a, b) => a.at - b.at)
        .map((e) => ({ incidentId: incident.id, at: new Date(e.at), kind: e.kind, userId: e.userId ?? null, detail: e.detail })),
      { transaction },
    )
  })
}
