import { Op, QueryTypes } from 'sequelize'
import { localToInstant, onDutyAt, parseLocalDate, shiftsInWeek } from '@shared/roster'
import type { DutySpan, RosterOverride, WeeklyShift } from '@shared/roster'
import type {
  DutyContact,
  OnDutyResponse,
  OverrideInput,
  PublicOverride,
  PublicShift,
  RosterBackupResponse,
  RosterWeekResponse,
  RosterWeekSpan,
  ShiftInput,
} from '@shared/schemas/roster'
import type { Actor, UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { DutyOverride, DutyShift, User } from '../models'
import { canSeeSite } from '../access/scope'
import { sitesService } from '../sites'
import { perContext } from '../platform/per-context'

const DAY_MS = 86_400_000

/** A site's roster as the pure functions need it; instants in epoch milliseconds. */
type SiteRoster = {
  id: number
  organizationId: number
  timeZone: string
  backupUserId: number | null
  shifts: Array<{ userId: number; weekday: number; start: string; end: string }>
  overrides: Array<{ userId: number; kind: 'add' | 'remove'; startsAt: number; endsAt: number }>
}
type Person = Pick<User, 'id' | 'name' | 'email' | 'role'>

const contact = (user: Person): DutyContact => ({ userId: user.id, name: user.name, email: user.email })

/** The site, its weekly pattern and the overrides overlapping `[fromMs, toMs)`, in one query. */
async function loadRoster(ctx: AppContext, siteId: number, fromMs: number, toMs: number): Promise<SiteRoster | null> {
  const rows = await ctx.sequelize.query<SiteRoster>(
    `SELECT s.id, s.organization_id AS "organizationId", s.time_zone AS "timeZone", s.backup_user_id AS "backupUserId",
       COALESCE((SELECT json_agg(json_build_object('userId', d.user_id, 'weekday', d.weekday, 'start', d.start_time, 'end', d.end_time) ORDER BY d.id)
                 FROM duty_shifts d WHERE d.site_id = s.id), '[]') AS shifts,
       COALESCE((SELECT json_agg(json_build_object('userId', o.user_id, 'kind', o.kind,
                   'startsAt', (extract(epoch FROM o.starts_at) * 1000)::float8, 'endsAt', (extract(epoch FROM o.ends_at) * 1000)::float8) ORDER BY o.id)
                 FROM duty_overrides o WHERE o.site_id = s.id AND o.starts_at < :to AND o.ends_at > :from), '[]') AS overrides
     FROM sites s WHERE s.id = :siteId`,
    { type: QueryTypes.SELECT, replacements: { siteId, from: new Date(fromMs), to: new Date(toMs) } },
  )
  return rows[0] ?? null
}

/**
 * Only active owners and keepers take part: a person deactivated or made a viewer after being
 * rostered drops out, rather than receiving alerts they cannot act on. One query.
 */
async function dutyPicture(ctx: AppContext, roster: SiteRoster) {
  const referenced = [...roster.shifts, ...roster.overrides].map((r) => r.userId)
  if (roster.backupUserId) referenced.push(roster.backupUserId)
  const users: Person[] = await ctx.models.User.findAll({
    attributes: ['id', 'name', 'email', 'role'],
    where: {
      organizationId: roster.organizationId,
      active: true,
      role: { [Op.ne]: 'viewer' },
      [Op.or]: [{ id: { [Op.in]: referenced } }, { role: 'owner' }],
    },
    order: [['id', 'ASC']],
  })
  const people = new Map(users.map((u) => [u.id, u]))
  const pattern: WeeklyShift[] = roster.shifts.filter((s) => people.has(s.userId)).map((s) => ({ ...s, userId: String(s.userId) }))
  const overrides: RosterOverride[] = roster.overrides
    .filter((o) => people.has(o.userId))
    .map((o) => ({ userId: String(o.userId), kind: o.kind, startsAt: new Date(o.startsAt).toISOString(), endsAt: new Date(o.endsAt).toISOString() }))
  const backup = (roster.backupUserId ? people.get(roster.backupUserId) : undefined) ?? users.find((u) => u.role === 'owner') ?? null
  return { people, pattern, overrides, backup }
}

async function onDuty(ctx: AppContext, roster: SiteRoster, at: Date) {
  const picture = await dutyPicture(ctx, roster)
  const ids = onDutyAt(picture.pattern, picture.overrides, roster.timeZone, at.getTime())
  const onDutyNow = ids.map((id) => picture.people.get(Number(id)) as Person).sort((a, b) => a.id - b.id)
  return { onDutyNow, backup: picture.backup }
}

/**
 * The people an alert for `siteId` should reach at `at`: whoever is on duty, else the backup
 * contact (the site's, or the organization's first active owner); `[]` only when there is
 * nobody at all. Two queries; for the incident engine, so no actor.
 */
export async function dutyRecipients(ctx: AppContext, siteId: number, at: Date = new Date()): Promise<DutyContact[]> {
  // Only overrides covering `at` can change who is on duty at `at`.
  const roster = await loadRoster(ctx, siteId, at.getTime(), at.getTime() + 1)
  if (!roster) throw notFound('Site not found')
  const { onDutyNow, backup } = await onDuty(ctx, roster, at)
  return (onDutyNow.length ? onDutyNow : backup ? [backup] : []).map(contact)
}

/** Who is on duty at `at`, and the backup contact, for the wall. */
export async function whoIsOnDuty(ctx: AppContext, siteId: number, at: Date = new Date()) {
  const roster = await loadRoster(ctx, siteId, at.getTime(), at.getTime() + 1)
  if (!roster) throw notFound('Site not found')
  const { onDutyNow, backup } = await onDuty(ctx, roster, at)
  return { onDuty: onDutyNow.map(contact), backup: backup ? contact(backup) : null }
}

/** Stretches of `span` that none of `covers` (same person) covers. */
function uncoveredParts(span: DutySpan, covers: readonly DutySpan[]): DutySpan[] {
  let parts = [span]
  for (const cover of covers) {
    if (cover.userId !== span.userId) continue
    parts = parts.flatMap((p) => {
      if (cover.endsAt <= p.startsAt || cover.startsAt >= p.endsAt) return [p]
      const kept: DutySpan[] = []
      if (cover.startsAt > p.startsAt) kept.push({ ...p, endsAt: cover.startsAt })
      if (cover.endsAt < p.endsAt) kept.push({ ...p, startsAt: cover.endsAt })
      return kept
    })
  }
  return parts
}

function weekBounds(timeZone: string, weekStart: string) {
  const first = parseLocalDate(weekStart)
  const after = new Date(Date.UTC(first.year, first.month - 1, first.day + 7))
  const next = { year: after.getUTCFullYear(), month: after.getUTCMonth() + 1, day: after.getUTCDate() }
  return { startsAt: localToInstant(timeZone, first, 0), endsAt: localToInstant(timeZone, next, 0) }
}

export const rosterService = perContext((ctx: AppContext) => {
  const { models } = ctx
  const sites = sitesService(ctx)

  async function visibleRoster(actor: Actor, siteId: number, fromMs: number, toMs: number) {
    const roster = await loadRoster(ctx, siteId, fromMs, toMs)
    if (!roster || !canSeeSite(actor, roster)) throw notFound('Site not found')
    return roster
  }

  async function assertCanBeOnDuty(organizationId: number, userId: number) {
    const user = await models.User.findOne({ where: { id: userId, organizationId } })
    if (!user) throw badRequest('userId: unknown user', { userId: 'unknown user' })
    if (!user.active) throw badRequest('userId: this user is not active', { userId: 'this user is not active' })
    if (user.role === 'viewer') throw badRequest('userId: a viewer cannot be on duty', { userId: 'a viewer cannot be on duty' })
    return user
  }

  async function namesOf(userIds: number[]) {
    const users = await models.User.findAll({ attributes: ['id', 'name'], where: { id: { [Op.in]: [...new Set(userIds)] } } })
    return new Map(users.map((u) => [u.id, u.name]))
  }

  const publicShift = (s: DutyShift, names: Map<number, string>): PublicShift => ({
    id: s.id,
    siteId: s.siteId,
    userId: s.userId,
    userName: names.get(s.userId) ?? '',
    weekday: s.weekday,
    start: s.startTime,
    end: s.endTime,
  })
  const publicOverride = (o: DutyOverride, names: Map<number, string>): PublicOverride => ({
    id: o.id,
    siteId: o.siteId,
    userId: o.userId,
    userName: names.get(o.userId) ?? '',
    kind: o.kind,
    startsAt: o.startsAt.toISOString(),
    endsAt: o.endsAt.toISOString(),
    note: o.note,
    createdBy: o.createdBy,
  })

  async function findShift(actor: Actor, siteId: number, shiftId: number) {
    const site = await sites.find(actor, siteId)
    const shift = await models.DutyShift.findOne({ where: { id: shiftId, siteId: site.id } })
    if (!shift) throw notFound('Shift not found')
    return { site, shift }
  }

  async function backupOf(organizationId: number, backupUserId: number | null): Promise<RosterBackupResponse['backup']> {
    const where = { organizationId, active: true, ...(backupUserId ? { id: backupUserId } : { role: 'owner' }) }
    const user = await models.User.findOne({ where, order: [['id', 'ASC']] })
    return user ? contact(user) : null
  }

  return {
    dutyRecipients: (siteId: number, at?: Date) => dutyRecipients(ctx, siteId, at),

    async listShifts(actor: Actor, siteId: number): Promise<PublicShift[]> {
      const site = await sites.find(actor, siteId)
      const shifts = await models.DutyShift.findAll({
        where: { siteId: site.id },
        order: [
          ['weekday', 'ASC'],
          ['startTime', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const names = await namesOf(shifts.map((s) => s.userId))
      return shifts.map((s) => publicShift(s, names))
    },

    async createShift(actor: Actor, siteId: number, input: ShiftInput): Promise<PublicShift> {
      const site = await sites.find(actor, siteId)
      const user = await assertCanBeOnDuty(site.organizationId, input.userId)
      const shift = await models.DutyShift.create({
        organizationId: site.organizationId,
        siteId: site.id,
        userId: user.id,
        weekday: input.weekday,
        startTime: input.start,
        endTime: input.end,
      })
      return publicShift(shift, new Map([[user.id, user.name]]))
    },

    async updateShift(actor: Actor, siteId: number, shiftId: number, changes: Partial<ShiftInput>): Promise<PublicShift> {
      const { site, shift } = await findShift(actor, siteId, shiftId)
      if (changes.userId !== undefined) await assertCanBeOnDuty(site.organizationId, changes.userId)
      await shift.update({
        ...(changes.userId !== undefined ? { userId: changes.userId } : {}),
        ...(changes.weekday !== undefined ? { weekday: changes.weekday } : {}),
        ...(changes.start !== undefined ? { startTime: changes.start } : {}),
        ...(changes.end !== undefined ? { endTime: changes.end } : {}),
      })
      return publicShift(shift, await namesOf([shift.userId]))
    },

    async deleteShift(actor: Actor, siteId: number, shiftId: number): Promise<void> {
      const { shift } = await findShift(actor, siteId, shiftId)
      await shift.destroy()
    },

    async listOverrides(actor: Actor, siteId: number, range: { from?: string; to?: string }): Promise<PublicOverride[]> {
      const site = await sites.find(actor, siteId)
      const from = range.from ? new Date(range.from) : new Date()
      const overrides = await models.DutyOverride.findAll({
        where: { siteId: site.id, endsAt: { [Op.gt]: from }, ...(range.to ? { startsAt: { [Op.lt]: new Date(range.to) } } : {}) },
        order: [
          ['startsAt', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const names = await namesOf(overrides.map((o) => o.userId))
      return overrides.map((o) => publicOverride(o, names))
    },

    async createOverride(actor: UserActor, siteId: number, input: OverrideInput): Promise<PublicOverride> {
      const site = await sites.find(actor, siteId)
      const user = await assertCanBeOnDuty(site.organizationId, input.userId)
      const override = await models.DutyOverride.create({
        organizationId: site.organizationId,
        siteId: site.id,
        userId: user.id,
        kind: input.kind,
        startsAt: new Date(input.startsAt),
        endsAt: new Date(input.endsAt),
        note: input.note,
        createdBy: actor.userId,
      })
      return publicOverride(override, new Map([[user.id, user.name]]))
    },

    async deleteOverride(actor: Actor, siteId: number, overrideId: number): Promise<void> {
      const site = await sites.find(actor, siteId)
      const override = await models.DutyOverride.findOne({ where: { id: overrideId, siteId: site.id } })
      if (!override) throw notFound('Override not found')
      await override.destroy()
    },

    async setBackup(actor: Actor, siteId: number, userId: number | null): Promise<RosterBackupResponse> {
      const site = await sites.find(actor, siteId)
      if (userId !== null) await assertCanBeOnDuty(site.organizationId, userId)
      // The column belongs to this feature; the Site model does not declare it.
      await ctx.sequelize.query('UPDATE sites SET backup_user_id = :userId, updated_at = now() WHERE id = :siteId', {
        replacements: { userId, siteId: site.id },
      })
      return { siteId: site.id, backupUserId: userId, backup: await backupOf(site.organizationId, userId) }
    },

    async onDutyNow(actor: Actor, siteId: number, at: Date = new Date()): Promise<OnDutyResponse> {
      const roster = await visibleRoster(actor, siteId, at.getTime(), at.getTime() + 1)
      const { onDutyNow, backup } = await onDuty(ctx, roster, at)
      return {
        siteId: roster.id,
        at: at.toISOString(),
        timeZone: roster.timeZone,
        onDuty: onDutyNow.map(contact),
        backup: backup ? contact(backup) : null,
        usingBackup: onDutyNow.length === 0 && backup !== null,
      }
    },

    async week(actor: Actor, siteId: number, weekStart: string): Promise<RosterWeekResponse> {
      const day = parseLocalDate(weekStart)
      // Wide enough for any zone's offset and for shifts running into the days either side.
      const around = Date.UTC(day.year, day.month - 1, day.day)
      const roster = await visibleRoster(actor, siteId, around - 3 * DAY_MS, around + 10 * DAY_MS)
      const { people, pattern, overrides } = await dutyPicture(ctx, roster)
      const week = weekBounds(roster.timeZone, weekStart)
      const fromPattern = shiftsInWeek(
        pattern,
        overrides.filter((o) => o.kind === 'remove'),
        roster.timeZone,
        weekStart,
      )
      const fromOverrides = shiftsInWeek(pattern, overrides, roster.timeZone, weekStart)
        .flatMap((span) => uncoveredParts(span, fromPattern))
        .filter((span) => span.endsAt > week.startsAt && span.startsAt < week.endsAt)
      const labelled = [
        ...fromPattern.map((span) => ({ span, source: 'pattern' as const })),
        ...fromOverrides.map((span) => ({ span, source: 'override' as const })),
      ].sort((a, b) => a.span.startsAt - b.span.startsAt || Number(a.span.userId) - Number(b.span.userId))
      const spans: RosterWeekSpan[] = labelled.map(({ span, source }) => ({
        userId: Number(span.userId),
        name: people.get(Number(span.userId))?.name ?? '',
        startsAt: new Date(span.startsAt).toISOString(),
        endsAt: new Date(span.endsAt).toISOString(),
        source,
      }))
      return { weekStart, timeZone: roster.timeZone, spans }
    },
  }
})
