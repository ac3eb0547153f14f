// The build report: what went into the tank, the steps with their dates, the readings through
// cycling, photos, livestock and the care plan that follows, as data the PDF and the mail render.
import { formatLocalDate, localDateAt } from '@shared/time/zoned'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { buildsService } from './builds'
import { photosInPeriod } from '../photos'
import { visibleTank } from '../access/scope'
import { kitRowsBetween } from '../readings'

const REPORT_METRICS = ['temperature', 'ph', 'ammonia', 'nitrite', 'nitrate'] as const
const MAX_TESTS = 60

export type BuildReport = Awaited<ReturnType<typeof loadBuildReport>>

export async function loadBuildReport(ctx: AppContext, actor: UserActor, tankId: number, now: Date) {
  const tank = await visibleTank(ctx, actor, tankId)
  const build = await buildsService(ctx).get(actor, tankId, now)
  const site = (tank as typeof tank & { site?: { name: string; timeZone: string } }).site
  const timeZone = site?.timeZone ?? 'UTC'
  const from = build.filledOn ? new Date(`${build.filledOn}T00:00:00Z`).getTime() - 86_400_000 : now.getTime()
  const cycledAt = build.steps.find((s) => s.key === 'cycling')?.doneAt
  const until = cycledAt ? Date.parse(cycledAt) : now.getTime()
  const rows = await kitRowsBetween(ctx.sequelize, tank.id, [...REPORT_METRICS], new Date(from), new Date(until))
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
