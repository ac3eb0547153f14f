import { Op, type Transaction } from 'sequelize'
import { defaultProbeRules, defaultRulesForTank } from '@shared/rules/defaults'
import type { PublicRule, RuleInput } from '@shared/schemas/rules'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { badRequest, notFound } from '../platform/errors'
import type { WatchRule } from '../models'
import { sitesService } from '../sites'
import { visibleTank } from '../access/scope'
import type { CreatedDevice, CreatedTank } from '../platform/events'
import { perContext } from '../platform/per-context'

export type EffectiveRule = { rule: WatchRule; tankId: number }

function present(rule: WatchRule, extra: Partial<PublicRule> = {}): PublicRule {
  return {
    id: rule.id,
    scope: rule.tankId ? 'tank' : 'site',
    siteId: rule.siteId,
    tankId: rule.tankId,
    overridesRuleId: rule.overridesRuleId ?? null,
    name: rule.name,
    severity: rule.severity,
    spec: rule.spec,
    enabled: rule.enabled,
    ...extra,
  }
}

/** Watch rules: per tank, or site-wide unless a tank overrides them. */
export const rulesService = perContext((ctx: AppContext) => {
  const { models, events } = ctx
  const changed = (tankIds: number[] | 'all') => events.emit('rules.changed', { tankIds })

  async function findRule(actor: UserActor, id: number) {
    const rule = await models.WatchRule.findOne({ where: { id, organizationId: actor.organizationId } })
    if (!rule) throw notFound('Rule not found')
    await sitesService(ctx).find(actor, rule.siteId)
    return rule
  }

  /** The rules each tank is watched by: its own, plus the site's that it does not override. */
  async function effectiveRules(where: { tankIds?: number[] } = {}): Promise<EffectiveRule[]> {
    const tanks = await models.Tank.findAll({
      where: { archivedAt: null, stage: { [Op.ne]: 'empty' }, ...(where.tankIds ? { id: where.tankIds } : {}) },
      attributes: ['id', 'siteId'],
    })
    if (!tanks.length) return []
    const rules = await models.WatchRule.findAll({
      where: {
        [Op.or]: [{ tankId: tanks.map((t) => t.id) }, { tankId: null, siteId: [...new Set(tanks.map((t) => t.siteId))] }],
      },
    })
    const result: EffectiveRule[] = []
    for (const tank of tanks) {
      const own = rules.filter((r) => r.tankId === tank.id)
      const overridden = new Set(own.map((r) => r.overridesRuleId).filter(Boolean))
      for (const r of own) if (r.enabled) result.push({ rule: r, tankId: tank.id })
      for (const r of rules) {
        if (r.tankId === null && r.siteId === tank.siteId && r.enabled && !overridden.has(r.id)) result.push({ rule: r, tankId: tank.id })
      }
    }
    return result
  }

  return {
    effectiveRules,

    /** The starter rules every new tank gets (see shared/rules/defaults). */
    async createDefaults(tank: CreatedTank, transaction?: Transaction) {
      const drafts = defaultRulesForTank({
        kind: tank.kind,
        targets: { temperature: tank.targets.temperature, ph: tank.targets.ph },
        heaterTopCm: tank.heater?.topCm,
      })
      await models.WatchRule.bulkCreate(
        drafts.map((d) => ({ ...d, organizationId: tank.organizationId, siteId: tank.siteId, tankId: tank.id })),
        { transaction },
      )
      changed([tank.id])
    },

    /** A new probe's rules on its tank, for each metric the tank has none of that kind for yet. */
    async createProbeDefaults(device: CreatedDevice) {
      const existing = await models.WatchRule.findAll({ where: { tankId: device.tankId }, attributes: ['spec'] })
      const has = new Set(existing.map((r) => `${r.spec.kind}:${'metric' in r.spec ? r.spec.metric : ''}`))
      const drafts = defaultProbeRules(device.metrics).filter((d) => !has.has(`${d.spec.kind}:${'metric' in d.spec ? d.spec.metric : ''}`))
      if (!drafts.length) return
      await models.WatchRule.bulkCreate(drafts.map((d) => ({ ...d, organizationId: device.organizationId, siteId: device.siteId, tankId: device.tankId })))
      changed([device.tankId])
    },

    async listForTank(actor: UserActor, tankId: number, status?: (ruleId: number) => PublicRule['status']) {
      const tank = await visibleTank(ctx, actor, tankId)
      const rules = await models.WatchRule.findAll({
        where: { [Op.or]: [{ tankId: tank.id }, { tankId: null, siteId: tank.siteId }] },
        order: [['id', 'ASC']],
      })
      const overridden = new Set(rules.map((r) => r.overridesRuleId).filter(Boolean))
      return rules.map((r) => present(r, { ...(r.tankId ? {} : { overriddenHere: overridden.has(r.id) }), status: status?.(r.id) }))
    },

    async listForSite(actor: UserActor, siteId: number) {
      await sitesService(ctx).find(actor, siteId)
      const rules = await models.WatchRule.findAll({ where: { siteId, tankId: null }, order: [['id', 'ASC']] })
      return rules.map((r) => present(r))
    },

    async createForTank(actor: UserActor, tankId: number, input: RuleInput) {
      const tank = await visibleTank(ctx, actor, tankId)
      const rule = await models.WatchRule.create({
        ...input,
        organizationId: actor.organizationId,
        siteId: tank.siteId,
        tankId: tank.id,
        createdBy: actor.userId,
      })
      changed([tank.id])
      return present(rule)
    },

    async createForSite(actor: UserActor, siteId: number, input: RuleInput) {
      await sitesService(ctx).find(actor, siteId)
      const rule = await models.WatchRule.create({ ...input, organizationId: actor.organizationId, siteId, tankId: null, createdBy: actor.userId })
      changed('all')
      return present(rule)
    },

    /** A tank's own version of a site-wide rule (change its limits, or set `enabled: false` to opt out). */
    async overrideForTank(actor: UserActor, tankId: number, siteRuleId: number, input: Partial<RuleInput>) {
      const tank = await visibleTank(ctx, actor, tankId)
      const siteRule = await findRule(actor, siteRuleId)
      if (siteRule.tankId !== null || siteRule.siteId !== tank.siteId) {
        throw badRequest('ruleId: not a site-wide rule of this tank’s site', { ruleId: 'not a site-wide rule of this site' })
      }
      const existing = await models.WatchRule.findOne({ where: { tankId: tank.id, overridesRuleId: siteRule.id } })
      const fields = {
        name: input.name ?? siteRule.name,
        severity: input.severity ?? siteRule.severity,
        spec: input.spec ?? siteRule.spec,
        enabled: input.enabled ?? true,
      }
      const rule = existing
        ? await existing.update(fields)
        : await models.WatchRule.create({
            ...fields,
            organizationId: actor.organizationId,
            siteId: tank.siteId,
            tankId: tank.id,
            overridesRuleId: siteRule.id,
            createdBy: actor.userId,
          })
      changed([tank.id])
      return present(rule)
    },

    async update(actor: UserActor, id: number, changes: Partial<RuleInput>) {
      const rule = await findRule(actor, id)
      await rule.update(changes)
      changed(rule.tankId ? [rule.tankId] : 'all')
      return present(rule)
    },

    async remove(actor: UserActor, id: number) {
      const rule = await findRule(actor, id)
      await rule.destroy()
      changed(rule.tankId ? [rule.tankId] : 'all')
    },
  }
})
