import { numberedNames } from '@shared/tank-names'
import type { UserActor } from '../access/actor'
import { presentTank } from './tanks'
import { visibleTank } from '../access/scope'
import type { AppContext } from '../context'
import { equipmentService } from '../equipment'
import { badRequest } from '../platform/errors'

/**
 * `count` copies of a tank at its site, with numbered names: same kind, stage, size, equipment,
 * targets, its own watch rules and care tasks (never done yet). All or nothing, in one transaction.
 */
export async function duplicateTank(ctx: AppContext, actor: UserActor, id: number, count: number) {
  const { models, sequelize } = ctx
  const source = await visibleTank(ctx, actor, id)
  if (source.archivedAt) throw badRequest('id: an archived tank cannot be copied', { id: 'the tank is archived' })
  const siteTanks = await models.Tank.findAll({ where: { siteId: source.siteId }, attributes: ['name'] })
  const names = numberedNames(
    source.name,
    count,
    siteTanks.map((t) => t.name),
  )
  const rules = await models.WatchRule.findAll({ where: { tankId: source.id }, order: [['id', 'ASC']] })
  const allTasks = await models.CareTask.findAll({ where: { tankId: source.id }, order: [['id', 'ASC']] })
  // A build's steps belong to that build and a treatment course's tasks to that course; an equipment
  // service belongs to its piece of equipment, and each copy gets its own pieces and their reminders.
  const buildSteps = await models.BuildStep.findAll({ where: { careTaskId: allTasks.map((t) => t.id) }, attributes: ['careTaskId'] })
  const stepTaskIds = new Set(buildSteps.map((s) => s.careTaskId))
  const tasks = allTasks.filter((t) => !stepTaskIds.has(t.id) && t.kind !== 'equipment_service' && t.treatmentCourseId == null)

  const created = await sequelize.transaction(async (transaction) => {
    const tanks = []
    for (const name of names) {
      const tank = await models.Tank.create(
        {
          organizationId: source.organizationId,
          siteId: source.siteId,
          name,
          kind: source.kind,
          stage: source.stage,
          dimensions: source.dimensions,
          volumeLitres: source.volumeLitres,
          volumeSource: source.volumeSource,
          substrateDepthCm: source.substrateDepthCm,
          heater: source.heater,
          filter: source.filter,
          media: source.media,
          lightSchedule: source.lightSchedule,
          targets: source.targets,
          notes: '',
          sortOrder: source.sortOrder,
        },
        { transaction },
      )
      await models.WatchRule.bulkCreate(
        rules.map((r) => ({
          organizationId: r.organizationId,
          siteId: r.siteId,
          tankId: tank.id,
          overridesRuleId: r.overridesRuleId,
          name: r.name,
          severity: r.severity,
          spec: r.spec,
          enabled: r.enabled,
          createdBy: actor.userId,
        })),
        { transaction },
      )
      await models.CareTask.bulkCreate(
        tasks.map((t) => ({
          organizationId: t.organizationId,
          tankId: tank.id,
          kind: t.kind,
          title: t.title,
          recurrence: t.recurrence,
          defaultValues: t.defaultValues,
          startsOn: t.startsOn,
          active: t.active,
          consumableId: t.consumableId,
          consumableAmount: t.consumableAmount,
          createdBy: actor.userId,
        })),
        { transaction },
      )
      await equipmentService(ctx).copyToTank(source.id, tank.id, actor.userId, transaction)
      tanks.push(tank)
    }
    return tanks
  })
  ctx.events.emit('rules.changed', { tankIds: created.map((t) => t.id) })
  const withSite = await Promise.all(created.map((t) => visibleTank(ctx, actor, t.id)))
  return { items: withSite.map(presentTank) }
}
