import { Op, type Transaction } from 'sequelize'
import { buildFigures, buildDay, buildTimeline, redateStocking, zeroOnConsecutiveTests, type BuildFigures, type TimelineEvent } from '@shared/build'
import { defaultCareTasksFor } from '@shared/care/defaults'
import { speciesByKey } from '@shared/care/species'
import type { TankShape } from '@shared/chemistry/volume'
import { addDays, formatLocalDate, localDateAt, parseLocalDate } from '@shared/time/zoned'
import type { BuildPlan, BuildStartInput, BuildStepDoneInput, PublicBuild, PublicBuildStep } from '@shared/schemas/build'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, conflict, notFound } from '../platform/errors'
import type { BuildStep, Tank, TankBuild } from '../models'
import { groupTests, livestockService } from '../care'
import { instantNotAhead, writeCareLog } from '../care'
import { nitrogenReadings } from '../care'
import { tankScope, visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

const DAY_MS = 86_400_000
/** A fill date further back is a record being typed up, not a build being run. */
const MAX_FILLED_DAYS_AGO = 120
const zoneOf = (tank: Tank) => (tank as Tank & { site?: { timeZone: string } }).site?.timeZone ?? 'UTC'
const todayAt = (tank: Tank, now: Date) => formatLocalDate(localDateAt(zoneOf(tank), now.getTime()))

/** The shared computations refuse impossible input with a RangeError naming the field first. */
function asBadRequest<T>(compute: () => T): T {
  try {
    return compute()
  } catch (error) {
    if (!(error instanceof RangeError)) throw error
    const field = /^[\w.]+/.exec(error.message)?.[0] ?? 'plan'
    throw badRequest(`${field}: ${error.message}`, { [field]: error.message })
  }
}

function shapeOf(tank: Tank): TankShape {
  if (!tank.dimensions) throw badRequest('dimensions: enter the tank’s inside dimensions to plan its build', { dimensions: 'the tank has no dimensions' })
  return tank.dimensions as TankShape
}

export function figuresFor(tank: Tank, plan: BuildPlan): BuildFigures {
  const shape = shapeOf(tank)
  return asBadRequest(() =>
    buildFigures({
      shape,
      kind: tank.kind,
      fillHeightCm: plan.fillHeightCm,
      glassThicknessMm: plan.glassThicknessMm,
      roomC: plan.roomC,
      setPointC: plan.heater.setPointC,
      substrate: plan.substrate,
      hardscape: plan.hardscape,
      labelRate: plan.water.labelRate,
      targets: { temperature: plan.water.temperature ?? undefined, ph: plan.water.ph ?? undefined },
      groups: plan.stocking.flatMap((s) => s.groups),
    }),
  )
}

/** The tank's own fields the rest of the product reads (the water-change planner reads substrate depth and heater). */
function tankFieldsFrom(tank: Tank, plan: BuildPlan, figures: BuildFigures) {
  const topCm = plan.heater.topCm ?? Math.floor(figures.heater.topMaxCm * 2) / 2
  if (plan.fillHeightCm > shapeOf(tank).heightCm) throw badRequest('fillHeightCm: cannot be above the tank', { fillHeightCm: 'cannot be above the tank' })
  if (topCm > figures.heater.topMaxCm + 1e-9 || topCm < figures.heater.minTopCm) {
    const message = `place it between ${figures.heater.minTopCm} cm (the substrate) and ${figures.heater.topMaxCm.toFixed(1)} cm (the level after a 50 % water change)`
    throw badRequest(`heater.topCm: ${message}`, { 'heater.topCm': message })
  }
  const bands = figures.stocking.bands
  return {
    substrateDepthCm: figures.substrate.depthCm,
    heater: { watts: plan.heater.watts ?? figures.heater.watts, setPointC: plan.heater.setPointC, topCm },
    filter: plan.filter.name,
    media: plan.filter.media.join(' → ').slice(0, 300),
    lightSchedule: plan.light,
    targets: {
      ...tank.targets,
      ...((plan.water.temperature ?? bands.temperature) ? { temperature: plan.water.temperature ?? bands.temperature! } : {}),
      ...((plan.water.ph ?? bands.ph) ? { ph: plan.water.ph ?? bands.ph! } : {}),
    },
  }
}

function presentStep(step: BuildStep): PublicBuildStep {
  return {
    key: step.key,
    title: step.title,
    day: step.day,
    untilDay: step.untilDay,
    dueOn: step.dueOn,
    daily: step.untilDay !== null,
    doneAt: step.doneAt?.toISOString() ?? null,
    doneBy: step.doneBy ?? null,
    careTaskId: step.careTaskId ?? null,
    notes: step.notes,
  }
}

/** The build day of the first stocking (or the day after the cycling tests' planned end). */
export function aboutDaysOf(steps: BuildStep[]): number | null {
  const stock = steps.filter((s) => s.key.startsWith('stock_')).map((s) => s.day)
  if (stock.length) return Math.min(...stock)
  const cycling = steps.find((s) => s.key === 'cycling')
  return cycling?.untilDay ? cycling.untilDay + 1 : null
}

/** "Build day 9 of about 28" for the tanks named that are filled and not yet finished; no actor, the caller scopes the ids. */
export async function buildDaysFor(ctx: AppContext, tankIds: number[], timeZone: string, now: Date) {
  const result = new Map<number, { day: number; aboutDays: number | null }>()
  if (!tankIds.length) return result
  const builds = await ctx.models.TankBuild.findAll({ where: { tankId: tankIds, filledOn: { [Op.ne]: null }, finishedAt: null } })
  if (!builds.length) return result
  const steps = await ctx.models.BuildStep.findAll({ where: { buildId: builds.map((b) => b.id) } })
  const today = formatLocalDate(localDateAt(timeZone, now.getTime()))
  for (const b of builds) {
    result.set(b.tankId, { day: buildDay(b.filledOn as string, today), aboutDays: aboutDaysOf(steps.filter((s) => s.buildId === b.id)) })
  }
  return result
}

export const buildsService = perContext((ctx: AppContext) => {
  const { models, sequelize } = ctx

  async function findBuild(tank: Tank) {
    const build = await models.TankBuild.findOne({ where: { tankId: tank.id } })
    if (!build) throw notFound('No build plan for this tank yet')
    return build
  }

  async function cycledSince(tank: Tank, build: TankBuild) {
    const since = new Date(`${build.filledOn}T00:00:00Z`).getTime() - DAY_MS
    return zeroOnConsecutiveTests(groupTests(await nitrogenReadings(ctx, tank.id, new Date(since))))
  }

  /** A one-off step marked done from the care list counts as ticked here too. */
  async function syncFromCareTasks(steps: BuildStep[]) {
    const open = steps.filter((s) => !s.doneAt && s.untilDay === null && s.careTaskId && !s.key.startsWith('stock_'))
    if (!open.length) return
    const tasks = await models.CareTask.findAll({ where: { id: open.map((s) => s.careTaskId as number), lastDoneAt: { [Op.ne]: null } } })
    for (const task of tasks) {
      const step = open.find((s) => s.careTaskId === task.id) as BuildStep
      await sequelize.transaction(async (transaction) => {
        await step.update({ doneAt: task.lastDoneAt, doneBy: task.lastDoneBy }, { transaction })
        await task.update({ active: false }, { transaction })
      })
    }
  }

  async function view(tank: Tank, build: TankBuild, now: Date): Promise<PublicBuild> {
    const steps = await models.BuildStep.findAll({
      where: { buildId: build.id },
      order: [
        ['day', 'ASC'],
        ['id', 'ASC'],
      ],
    })
    await syncFromCareTasks(steps)
    const filled = build.filledOn ?? null
    return {
      tankId: tank.id,
      plan: build.plan,
      filledOn: filled,
      day: filled ? buildDay(filled, todayAt(tank, now)) : null,
      aboutDays: aboutDaysOf(steps),
      finishedAt: build.finishedAt?.toISOString() ?? null,
      steps: steps.map(presentStep),
      cycled: steps.some((s) => s.key === 'cycling' && s.doneAt !== null),
      updatedAt: build.updatedAt.toISOString(),
    }
  }

  /** Moves the open stocking steps (and their care tasks) to the days what happened allows. */
  async function redate(build: TankBuild, steps: BuildStep[], event: TimelineEvent, transaction: Transaction) {
    const stock = steps.filter((s) => s.key.startsWith('stock_')).sort((a, b) => Number(a.key.slice(6)) - Number(b.key.slice(6)))
    const days = redateStocking(
      stock.map((s) => s.day),
      build.plan.stocking.map((s) => s.settleDays),
      event,
    )
    const filled = parseLocalDate(build.filledOn as string)
    for (const [i, step] of stock.entries()) {
      const day = days[i] as number
      if (step.doneAt || day === step.day) continue
      const dueOn = formatLocalDate(addDays(filled, day - 1))
      await step.update({ day, dueOn }, { transaction })
      if (step.careTaskId) await models.CareTask.update({ startsOn: dueOn }, { where: { id: step.careTaskId }, transaction })
    }
  }

  async function setStage(tank: Tank, stage: 'cycling' | 'established', transaction: Transaction) {
    if (tank.stage === stage) return
    await tank.update({ stage }, { transaction })
    await sequelize.query('UPDATE tanks SET stage_changed_at = now() WHERE id = $1', { bind: [tank.id], transaction })
  }

  return {
    figuresFor,

    async get(actor: UserActor, tankId: number, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      return view(tank, await findBuild(tank), now)
    },

    /** Saves the plan and writes its figures into the tank (substrate depth, heater, filter, light, targets). */
    async savePlan(actor: UserActor, tankId: number, plan: BuildPlan, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      const figures = figuresFor(tank, plan)
      const fields = tankFieldsFrom(tank, plan, figures)
      const build = await sequelize.transaction(async (transaction) => {
        await tank.update(fields, { transaction })
        const existing = await models.TankBuild.findOne({ where: { tankId: tank.id }, transaction, lock: transaction.LOCK.UPDATE })
        if (existing) return existing.update({ plan }, { transaction })
        return models.TankBuild.create({ organizationId: actor.organizationId, tankId: tank.id, plan, createdBy: actor.userId }, { transaction })
      })
      return { ...(await view(tank, build, now)), figures }
    },

    /** The tank is filled: the dated steps and their care tasks, and the stage moves to cycling. */
    async start(actor: UserActor, tankId: number, input: BuildStartInput, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      const build = await findBuild(tank)
      if (build.filledOn) throw conflict('build_started', `This build was filled on ${build.filledOn}; its timeline is already running`)
      const today = todayAt(tank, now)
      const ago = buildDay(input.filledOn, today) - 1
      if (ago < 0) throw badRequest('filledOn: cannot be in the future', { filledOn: 'cannot be in the future' })
      if (ago > MAX_FILLED_DAYS_AGO)
        throw badRequest(`filledOn: at most ${MAX_FILLED_DAYS_AGO} days ago`, { filledOn: `at most ${MAX_FILLED_DAYS_AGO} days ago` })
      const plan = build.plan
      const timeline = asBadRequest(() =>
        buildTimeline({
          filledOn: input.filledOn,
          setPointC: plan.heater.setPointC,
          ph: { start: plan.water.startPh, min: tank.targets.ph?.min ?? 6.5, max: tank.targets.ph?.max ?? 7.5, maxChangePerDay: plan.water.maxPhChangePerDay },
          plants: plan.plants,
          stages: plan.stocking.map((s) => ({
            label: s.label || s.groups.map((g) => `${g.count} × ${speciesByKey(g.speciesKey)?.commonName ?? g.speciesKey}`).join(', '),
            settleDays: s.settleDays,
          })),
        }),
      )
      await sequelize.transaction(async (transaction) => {
        // Two fills at once: the second waits here, then finds the first one's date.
        const locked = await models.TankBuild.findOne({ where: { id: build.id }, lock: transaction.LOCK.UPDATE, transaction })
        if (locked?.filledOn) throw conflict('build_started', `This build was filled on ${locked.filledOn}; its timeline is already running`)
        // A tank set up empty has no routine yet: it gets the usual one, starting with the first stocking.
        if (!(await models.CareTask.count({ where: { tankId: tank.id }, transaction }))) {
          const startsOn = timeline.steps.find((st) => st.day === timeline.aboutDays)?.dueOn ?? input.filledOn
          const routine = defaultCareTasksFor({ kind: tank.kind, stage: 'established' })
          await models.CareTask.bulkCreate(
            routine.map((d) => ({ ...d, organizationId: tank.organizationId, tankId: tank.id, startsOn })),
            { transaction },
          )
        }
        for (const step of timeline.steps) {
          const testing = step.key === 'ph' || step.key === 'cycling'
          const task = await models.CareTask.create(
            {
              organizationId: tank.organizationId,
              tankId: tank.id,
              kind: testing ? 'test_kit_check' : 'other',
              title: `Build: ${step.title}`.slice(0, 200),
              recurrence: { kind: 'interval', everyDays: 1 },
              startsOn: step.dueOn,
              createdBy: actor.userId,
            },
            { transaction },
          )
          await models.BuildStep.create(
            {
              buildId: build.id,
              tankId: tank.id,
              key: step.key,
              title: step.title,
              day: step.day,
              untilDay: step.untilDay,
              dueOn: step.dueOn,
              careTaskId: task.id,
            },
            { transaction },
          )
        }
        await build.update({ filledOn: input.filledOn }, { transaction })
        await setStage(tank, 'cycling', transaction)
      })
      return view(tank, build, now)
    },

    /** Ticks a step; cycling needs zero ammonia and nitrite on consecutive tests, stocking needs cycling and settled stages. */
    async tick(actor: UserActor, tankId: number, key: string, input: BuildStepDoneInput, now = new Date()) {
      const tank = await visibleTank(ctx, actor, tankId)
      const build = await findBuild(tank)
      const steps = await models.BuildStep.findAll({
        where: { buildId: build.id },
        order: [
          ['day', 'ASC'],
          ['id', 'ASC'],
        ],
      })
      const step = steps.find((s) => s.key === key)
      if (!step) throw notFound('No such step in this build')
      if (step.doneAt) throw conflict('step_done', 'This step is already ticked')
      const at = instantNotAhead(input.at, 'at', now)
      const tickDay = buildDay(build.filledOn as string, formatLocalDate(localDateAt(zoneOf(tank), at.getTime())))
      if (key === 'cycling' && !(await cycledSince(tank, build))) {
        throw conflict('not_cycled', 'Ammonia and nitrite have not yet read zero on two tests in a row: keep testing')
      }
      const added = []
      if (key.startsWith('stock_')) {
        if (!steps.some((s) => s.key === 'cycling' && s.doneAt)) throw conflict('not_cycled', 'Tick the cycling tests first: stock only a cycled tank')
        const index = Number(key.slice(6))
        const previous = steps.find((s) => s.key === `stock_${index - 1}`)
        const settleDays = build.plan.stocking[index - 2]?.settleDays ?? 0
        if (previous && !previous.doneAt) throw conflict('stage_order', `Stock stage ${index - 1} first`)
        if (previous?.doneAt && at.getTime() < previous.doneAt.getTime() + settleDays * DAY_MS) {
          const until = new Date(previous.doneAt.getTime() + settleDays * DAY_MS)
          throw conflict('settling', `Stage ${index - 1} is settling until ${formatLocalDate(localDateAt(zoneOf(tank), until.getTime()))} (${settleDays} days)`)
        }
      }
      await sequelize.transaction(async (transaction) => {
        // Two ticks at once: the second waits here, then finds the step done.
        const locked = await models.BuildStep.findOne({ where: { id: step.id }, lock: transaction.LOCK.UPDATE, transaction })
        if (locked?.doneAt) throw conflict('step_done', 'This step is already ticked')
        await step.update({ doneAt: at, doneBy: actor.userId, notes: input.notes }, { transaction })
        if (step.careTaskId) {
          await models.CareTask.update({ lastDoneAt: at, lastDoneBy: actor.userId, active: false }, { where: { id: step.careTaskId }, transaction })
        }
        await writeCareLog(
          ctx,
          {
            organizationId: tank.organizationId,
            tankId: tank.id,
            kind: 'task_done',
            at,
            userId: actor.userId,
            text: `Build day ${tickDay}: ${step.title}${input.notes ? ` — ${input.notes}` : ''}`,
            values: { buildStep: key },
            careTaskId: step.careTaskId ?? null,
          },
          transaction,
        )
        if (key === 'cycling') await setStage(tank, 'established', transaction)
        const event =
          key === 'cycling'
            ? { kind: 'cycled' as const, day: tickDay }
            : key.startsWith('stock_')
              ? { kind: 'stocked' as const, stage: Number(key.slice(6)), day: tickDay }
              : null
        if (event) await redate(build, steps, event, transaction)
        if (steps.every((s) => s.id === step.id || s.doneAt)) await build.update({ finishedAt: at }, { transaction })
      })
      // After the tick has committed, so two ticks at once can never add the animals twice.
      if (key.startsWith('stock_')) {
        for (const group of build.plan.stocking[Number(key.slice(6)) - 1]?.groups ?? []) {
          added.push(
            await livestockService(ctx).add(actor, tank.id, {
              speciesKey: group.speciesKey,
              count: group.count,
              addedAt: at.toISOString(),
              source: 'Build stocking',
              notes: '',
              acclimation: input.acclimation,
            }),
          )
        }
      }
      return { build: await view(tank, build, now), livestock: added }
    },

    /** Finished builds of tanks of the same shape and size, newest first: a start for this tank's plan. */
    async templates(actor: UserActor, tankId: number) {
      const tank = await visibleTank(ctx, actor, tankId)
      if (!tank.dimensions) return []
      const same = JSON.stringify(tank.dimensions)
      const builds = await models.TankBuild.findAll({
        where: { organizationId: actor.organizationId, finishedAt: { [Op.ne]: null }, tankId: { [Op.ne]: tank.id } },
        order: [['finishedAt', 'DESC']],
        limit: 50,
      })
      const others = new Map((await models.Tank.findAll({ where: { id: builds.map((b) => b.tankId), ...tankScope(actor) } })).map((o) => [o.id, o]))
      return builds.flatMap((b) => {
        const other = others.get(b.tankId)
        return other && JSON.stringify(other.dimensions) === same
          ? [{ tankId: other.id, tankName: other.name, finishedAt: b.finishedAt!.toISOString(), plan: b.plan }]
          : []
      })
    },
  }
})
