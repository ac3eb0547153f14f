import type { ClockStyle, Organization, OrganizationSettingsBody } from '@shared/schemas/auth'
import type { UserActor } from '../access/actor'
import type { Transaction } from 'sequelize'
import type { AppContext } from '../context'
import { notFound } from '../platform/errors'
import { perContext } from '../platform/per-context'
import { presentOrganization } from './present-user'

/** The organisation's own settings, changed by its owners. */
export const organizationService = perContext((ctx: AppContext) => ({
  async update(actor: UserActor, changes: OrganizationSettingsBody): Promise<Organization> {
    const organization = await ctx.models.Organization.findByPk(actor.organizationId)
    if (!organization) throw notFound('Organisation not found')
    organization.clockStyle = changes.clockStyle ?? organization.clockStyle
    await organization.save()
    return presentOrganization(organization.id, organization)
  },
}))

/** The clock the organisation's people read times on, for mails and PDFs written on its behalf. */
export async function clockStyleOf(ctx: AppContext, organizationId: number, transaction?: Transaction): Promise<ClockStyle> {
  const organization = await ctx.models.Organization.findByPk(organizationId, { attributes: ['clockStyle'], transaction })
  return organization?.clockStyle ?? '24h'
}
