// The build report: what went into the tank, the steps with their dates, the readings through
// cycling, photos, livestock and the care plan that follows; as data, a PDF and a mail.
import { QueryTypes } from 'sequelize'
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { UserActor } from '../auth/actor'
import type { AppContext } from '../context'
import { enqueueMail } from '../mail/outbox'
import { buildReportMail, buildReportFileName } from '../report/build-mail'
import { renderBuildReportPdf } from '../report/build-pdf'
import { buildsService } from './builds'
import { photosInPeriod } from './photos'
import { tanksService } from './tanks'

const REPORT_METRICS = ['temperature', 'ph', 'ammonia', 'nitrite', 'nitrate'] as const
const MAX_TESTS = 60

export type BuildReport = Awaited<ReturnType<typeof loadBuildReport>>

async function loadBuildReport(ctx: AppContext, actor: UserActor, tankId: number, now: Date) {
  const tank = await tanksService(ctx).find(actor, tankId)
  const build = await buildsService(ctx).get(actor, tankId, now)
  const site = (tank as typeof tank & { site?: { name: string; timeZone: string } }).site
  const timeZone = site?.timeZone ?? 'UTC'
  const from = build.filledOn ? new Date(`${build.filledOn}T00:00:00Z`).getTime() - 86_400_000 : now.getTime()
  const cycledAt = build.steps.find((s) => s.key === 'cycling')?.doneAt
  const until = cycledAt ? Date.parse(cycledAt) : now.getTime()
  const rows = await ctx.sequelize.query<{ sourceKey: string; time: Date; metric: string; value: number }>(
    `SELECT source_key AS "sourceKey", time, metric, value FROM readings
     WHERE tank_id = $1 AND source_key LIKE 'k:%' AND metric = ANY($2) AND time >= $3 AND time <= $4 ORDER BY time`,
    { bind: [tank.id, [...REPORT_METRICS], new Date(from), new Date(until)], type: QueryTypes.SELECT },
  )
  const tests = new Map<string, { at: string; values: Record<string, number> }>()
  for (const r of rows) {
    const key = `${r.sourceKey}@${new Date(r.time).getTime()}`
    const test = tests.get(key) ?? { at: new Date(r.time).toISOString(), values: {} }
    test.values[r.metric] = r.value
    tests.set(key, test)
  }
  const buildTaskIds = new Set(build.steps.map((s) => s.careTaskId))
  const careTasks = await ctx.models.CareTask.findAll({ where: { tankId: tank.id, active: true }, order: [['id', 'ASC']] })
  const livestock = await ctx.models.LivestockEntry.findAll({ where: { tankId: tank.id }, order: [['addedAt', 'ASC']] })
  return {
    generatedAt: now.toISOString(),
    tank: { id: tank.id, name: tank.name, siteName: site?.name ?? '', timeZone, dimensions: tank.dimensions, volumeLitres: tank.volumeLitres },
    build,
    figures: buildsService(ctx).figuresFor(tank, build.plan),
    tests: [...tests.values()].slice(-MAX_TESTS),
    photos: await photosInPeriod(ctx, tank.id, new Date(from), now),
    livestock: livestock.map((l) => ({ name: l.name, count: l.count, addedAt: l.addedAt.toISOString(), removed: l.removedAt !== null })),
    carePlan: careTasks
      .filter((t) => !buildTaskIds.has(t.id))
      .map((t) => ({ title: t.title, every: t.recurrence.kind === 'interval' ? `every ${t.recurrence.everyDays} days` : 'on set weekdays' })),
    today: formatLocalDate(localDateAt(timeZone, now.getTime())),
  }
}

export function buildReportService(ctx: AppContext) {
  return {
    load: (actor: UserActor, tankId: number, now = new Date()) => loadBuildReport(ctx, actor, tankId, now),

    async pdf(actor: UserActor, tankId: number, now = new Date()) {
      const report = await loadBuildReport(ctx, actor, tankId, now)
      return { pdf: await renderBuildReportPdf(report), fileName: buildReportFileName(report) }
    },

    /** Queues the report with its PDF to each address; answers how many were queued. */
    async mail(actor: UserActor, tankId: number, emails: string[], now = new Date()) {
      const report = await loadBuildReport(ctx, actor, tankId, now)
      const mail = buildReportMail(report, await renderBuildReportPdf(report))
      let queued = 0
      await ctx.sequelize.transaction(async (transaction) => {
        for (const to of [...new Set(emails.map((e) => e.toLowerCase()))]) {
          const id = await enqueueMail(ctx, {
            kind: 'report', to, ...mail, organizationId: actor.organizationId,
            dedupeKey: `build-report:${tankId}:${now.getTime()}:${to}`,
          }, { transaction })
          if (id !== null) queued++
        }
      })
      return { queued }
    },
  }
}
