import { QueryTypes } from 'sequelize'
import { CHECKLIST_STEPS, type ChecklistItem, type ChecklistStep } from '@shared/schemas/setup'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'

export type Checklist = {
  /** Steps neither done nor dismissed, in order; empty once the business is under way. */
  items: ChecklistItem[]
  /** Where the step links go: the first live site and tank, when there are any. */
  firstSiteId: number | null
  firstTankId: number | null
}

type Facts = {
  tanks: number
  devices: number
  shifts: number
  people: number
  walls: number
  firstSiteId: number | null
  firstTankId: number | null
  dismissed: string[]
}

/** The first steps after setup, each done when the data says so (a device exists, …), or hidden by the owner. */
export function checklistService(ctx: AppContext) {
  const { sequelize } = ctx

  async function facts(organizationId: number): Promise<Facts> {
    const [row] = await sequelize.query<Facts>(
      `SELECT
         (SELECT count(*)::int FROM tanks WHERE organization_id = :org AND archived_at IS NULL) AS tanks,
         (SELECT count(*)::int FROM devices WHERE organization_id = :org) AS devices,
         (SELECT count(*)::int FROM duty_shifts WHERE organization_id = :org) AS shifts,
         (SELECT count(*)::int FROM users WHERE organization_id = :org)
           + (SELECT count(*)::int FROM invitations WHERE organization_id = :org) AS people,
         (SELECT count(*)::int FROM wall_credentials WHERE organization_id = :org) AS walls,
         (SELECT min(id) FROM sites WHERE organization_id = :org AND archived_at IS NULL) AS "firstSiteId",
         (SELECT min(id) FROM tanks WHERE organization_id = :org AND archived_at IS NULL) AS "firstTankId",
         (SELECT checklist_dismissed FROM organizations WHERE id = :org) AS dismissed`,
      { type: QueryTypes.SELECT, replacements: { org: organizationId } },
    )
    return row
  }

  const doneBy: Record<ChecklistStep, (f: Facts) => boolean> = {
    tanks: (f) => f.tanks > 0,
    device: (f) => f.devices > 0,
    roster: (f) => f.shifts > 0,
    // The owner alone is one person; anyone else, signed up or invited, counts.
    people: (f) => f.people > 1,
    wall: (f) => f.walls > 0,
  }

  return {
    async forOwner(actor: UserActor): Promise<Checklist> {
      const f = await facts(actor.organizationId)
      const items = CHECKLIST_STEPS.filter((step) => !f.dismissed?.includes(step)).map((step) => ({ step, done: doneBy[step](f) }))
      return { items: items.every((i) => i.done) ? [] : items, firstSiteId: f.firstSiteId, firstTankId: f.firstTankId }
    },

    async dismiss(actor: UserActor, step: ChecklistStep) {
      await sequelize.query(
        `UPDATE organizations SET checklist_dismissed = array_append(checklist_dismissed, :step)
         WHERE id = :org AND NOT (:step = ANY (checklist_dismissed))`,
        { replacements: { org: actor.organizationId, step } },
      )
    },
  }
}
