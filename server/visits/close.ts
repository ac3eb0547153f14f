import { careDue } from '@shared/care/due'
import { kitVerdicts } from '@shared/care/kit-verdict'
import { METRICS, type MetricKey } from '@shared/metrics/registry'
import { toCanonical } from '@shared/metrics/units'
import type { VisitClose, VisitSheet, VisitTankWork } from '@shared/schemas/visits'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { instantNotAhead, writeCareLog } from '../care'
import { enqueueMail } from '../mail'
import { clockStyleOf } from '../people'
import { badRequest, conflict } from '../platform/errors'
import type { CareTask, Tank, TestKitEntry, Visit } from '../models'
import { presentVisits } from './present'
import { visitReportMail } from './report-mail'
import { renderVisitPdf } from './report-pdf'
import { visitsService } from './visits'

const bad = (field: string, message: string) => badRequest(`${field}: ${message}`, { [field]: message })

/** The readings of a test-kit entry with the tank's verdict on each (canonical units, the tank's own bands). */
function readingsOf(entry: TestKitEntry | undefined, tank: Tank): VisitTankWork['readings'] {
  if (!entry) return []
  const canonical: Partial<Record<MetricKey, number>> = {}
  for (const v of entry.values) {
    const converted = toCanonical(v.metric, v.value, v.unit)
    if (converted.ok) canonical[v.metric] = converted.value
  }
  const unitOf = (metric: MetricKey) => (metric === 'ph' ? '' : METRICS[metric].unitLabel)
  const verdicts = new Map(kitVerdicts(canonical, tank.targets, tank.stage, unitOf).map((v) => [v.metric, v]))
  return entry.values.map((v) => ({ ...v, verdict: verdicts.get(v.metric)?.verdict ?? 'no_band', summary: verdicts.get(v.metric)?.summary ?? '' }))
}

/** The next three care tasks due on a tank after the visit, soonest first. */
function nextCare(tasks: CareTask[], timeZone: string, after: Date): VisitTankWork['next'] {
  return tasks
    .map((task) => ({ title: task.title, dueDate: careDue(task, timeZone, after).dueOn }))
    .sort((a, b) => a.dueDate.localeCompare(b.dueDate) || a.title.localeCompare(b.title))
    .slice(0, 3)
}

/**
 * Closes a visit in one transaction: the ticked tasks are marked done and logged on each tank's
 * care log, what was done is kept on the visit, and the visit report (HTML mail with the PDF) goes
 * to the client's address and the client's people through the outbox.
 */
export async function closeVisit(
  ctx: AppContext,
  actor: UserActor,
  id: number,
  input: VisitClose,
  now = new Date(),
  /** `sendReport: false` only where the report went out long ago (the demo's history). */
  options: { sendReport?: boolean } = {},
): Promise<VisitSheet> {
  const { models } = ctx
  const visits = visitsService(ctx)
  const visit = await visits.findToWork(actor, id)
  const timeZone = visit.site?.timeZone ?? 'UTC'
  const arrivedAt = input.arrivedAt ? instantNotAhead(input.arrivedAt, 'arrivedAt', now) : (visit.arrivedAt ?? now)
  const leftAt = input.leftAt ? instantNotAhead(input.leftAt, 'leftAt', now) : now
  if (leftAt < arrivedAt) throw bad('leftAt', 'must not be before the arrival')

  const tanks = new Map((await models.Tank.findAll({ where: { id: visit.tankIds } })).map((t) => [t.id, t]))
  const tasks = await models.CareTask.findAll({ where: { tankId: visit.tankIds, active: true }, order: [['id', 'ASC']] })
  const kitIds = input.tanks.map((t) => t.kitEntryId).filter((v): v is number => v !== null)
  const entries = new Map((kitIds.length ? await models.TestKitEntry.findAll({ where: { id: kitIds, deletedAt: null } }) : []).map((e) => [e.id, e]))
  const photos = input.photoIds.length ? await models.Photo.findAll({ where: { id: input.photoIds, tankId: visit.tankIds }, attributes: ['id'] }) : []
  if (photos.length !== new Set(input.photoIds).size) throw bad('photoIds', "only photos of this visit's tanks")

  const seen = new Set<number>()
  for (const [index, t] of input.tanks.entries()) {
    if (!tanks.has(t.tankId) || seen.has(t.tankId)) throw bad(`tanks.${index}.tankId`, 'not a tank of this visit, or named twice')
    seen.add(t.tankId)
    for (const taskId of t.doneTaskIds) {
      if (!tasks.some((task) => task.id === taskId && task.tankId === t.tankId)) throw bad(`tanks.${index}.doneTaskIds`, 'not an active task of this tank')
    }
    if (t.kitEntryId !== null && entries.get(t.kitEntryId)?.tankId !== t.tankId) throw bad(`tanks.${index}.kitEntryId`, 'no such test-kit entry on this tank')
  }

  const work: VisitTankWork[] = visit.tankIds.map((tankId) => {
    const tank = tanks.get(tankId)!
    const given = input.tanks.find((t) => t.tankId === tankId)
    const done = tasks.filter((task) => given?.doneTaskIds.includes(task.id))
    const kit = given?.kitEntryId ? entries.get(given.kitEntryId) : undefined
    return {
      tankId,
      tankName: tank.name,
      doneTasks: done.map((task) => ({ id: task.id, title: task.title })),
      kitEntryId: kit?.id ?? null,
      readings: readingsOf(kit, tank),
      notes: given?.notes ?? '',
      next: [],
    }
  })
  const materialsText = input.materials.map((m) => `${m.amount} ${m.unit} ${m.what}`.replace(/\s+/g, ' ').trim()).join(', ')

  await ctx.sequelize.transaction(async (transaction) => {
    const locked = await models.Visit.findByPk(visit.id, { lock: transaction.LOCK.UPDATE, transaction })
    if (!locked || locked.state === 'closed') throw conflict('visit_closed', 'This visit is already closed')
    for (const w of work) {
      for (const { id: taskId } of w.doneTasks) {
        const task = tasks.find((t) => t.id === taskId)!
        // A late write-up never moves "last done" backwards.
        if (!task.lastDoneAt || task.lastDoneAt < leftAt) {
          await task.update({ lastDoneAt: leftAt, lastDoneBy: actor.userId, snoozedUntil: null, snoozeReason: null }, { transaction })
        }
        await writeCareLog(
          ctx,
          {
            organizationId: visit.organizationId,
            tankId: w.tankId,
            kind: 'task_done',
            at: leftAt,
            userId: actor.userId,
            text: `${task.title} (service visit)`,
            values: { taskKind: task.kind, ...task.defaultValues },
            careTaskId: task.id,
          },
          transaction,
        )
      }
      const note = [w.notes, input.notes, materialsText && `Used: ${materialsText}`].filter(Boolean).join(' · ')
      await writeCareLog(
        ctx,
        { organizationId: visit.organizationId, tankId: w.tankId, kind: 'note', at: leftAt, userId: actor.userId, text: `Service visit. ${note}`.trim() },
        transaction,
      )
      w.next = nextCare(
        tasks.filter((t) => t.tankId === w.tankId),
        timeZone,
        leftAt,
      )
    }
    await locked.update(
      {
        state: 'closed',
        arrivedAt,
        leftAt,
        notes: input.notes,
        materials: input.materials,
        photoIds: input.photoIds,
        work,
        closedAt: now,
        closedBy: actor.userId,
      },
      { transaction },
    )
    if (options.sendReport === false) return
    const [closed] = await presentVisits(ctx, [Object.assign(locked, { site: visit.site, client: visit.client, technician: visit.technician }) as Visit], now)
    const clock = await clockStyleOf(ctx, visit.organizationId, transaction)
    const pdf = await renderVisitPdf(ctx, closed, clock)
    const mail = visitReportMail(closed, pdf, new URL(`/visits/${visit.id}`, ctx.config.publicUrl).toString(), clock)
    for (const to of await recipientsOf(ctx, visit)) {
      await enqueueMail(ctx, { kind: 'visit_report', to, ...mail, organizationId: visit.organizationId, dedupeKey: `visit:${visit.id}:${to}` }, { transaction })
    }
  })
  return visits.get(actor, visit.id, now)
}

/** The client's own address and its active people, each once. */
async function recipientsOf(ctx: AppContext, visit: Visit): Promise<string[]> {
  const people = await ctx.models.User.findAll({ where: { clientId: visit.clientId, active: true }, attributes: ['email'] })
  const all = [visit.client?.email ?? '', ...people.map((p) => p.email)].map((a) => a.trim().toLowerCase()).filter(Boolean)
  return [...new Set(all)]
}
