import { Op } from 'sequelize'
import type { PublicSnooze, SnoozeInput } from '@shared/schemas/rules'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import type { Snooze } from '../models'
import { visibleTank } from '../access/scope'
import { perContext } from '../platform/per-context'

function present(s: Snooze): PublicSnooze {
  const suppresses = ['Alert e-mails for this tank’s warnings and alarms (incidents are still recorded and shown on the wall)']
  suppresses.push(
    s.includeHeaterLine ? 'ALSO heater-line alarms: nobody is told if the water falls to the heater top' : 'Not heater-line alarms: those are still sent',
  )
  return {
    id: s.id,
    tankId: s.tankId,
    reason: s.reason,
    startsAt: s.startsAt.toISOString(),
    endsAt: s.endsAt.toISOString(),
    weekly: s.weekly,
    repeatUntil: s.repeatUntil?.toISOString() ?? null,
    includeHeaterLine: s.includeHeaterLine,
    createdBy: s.createdBy,
    cancelledAt: s.cancelledAt?.toISOString() ?? null,
    suppresses,
  }
}

/** Snoozes of one tank's rules: always with an end, and the heater line only when asked for by name. */
export const snoozesService = perContext((ctx: AppContext) => {
  const { models, events } = ctx
  const changed = (tankId: number) => events.emit('rules.changed', { tankIds: [tankId] })
  return {
    async list(actor: UserActor, tankId: number) {
      await visibleTank(ctx, actor, tankId)
      const rows = await models.Snooze.findAll({
        where: { tankId, cancelledAt: null, [Op.or]: [{ endsAt: { [Op.gt]: new Date() } }, { repeatUntil: { [Op.gt]: new Date() } }] },
        order: [['startsAt', 'ASC']],
      })
      return rows.map(present)
    },
    async create(actor: UserActor, tankId: number, input: SnoozeInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const snooze = await models.Snooze.create({
        organizationId: actor.organizationId,
        tankId: tank.id,
        reason: input.reason,
        startsAt: new Date(input.startsAt),
        endsAt: new Date(input.endsAt),
        weekly: input.weekly,
        repeatUntil: input.repeatUntil ? new Date(input.repeatUntil) : null,
        includeHeaterLine: input.includeHeaterLine,
        createdBy: actor.userId,
      })
      changed(tank.id)
      return present(snooze)
    },
    async cancel(actor: UserActor, id: number) {
      const snooze = await models.Snooze.findOne({ where: { id, organizationId: actor.organizationId } })
      if (!snooze) throw notFound('Snooze not found')
      await visibleTank(ctx, actor, snooze.tankId)
      // Cancelling again keeps the first time: a later one would re-snooze the minutes in between.
      if (!snooze.cancelledAt) {
        await snooze.update({ cancelledAt: new Date() })
        changed(snooze.tankId)
      }
      return present(snooze)
    },
  }
})
