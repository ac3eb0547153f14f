import type { Organization as PublicOrganization, PublicUser } from '@shared/schemas/auth'
import type { Organization, User } from '../models'

/** The public shape of a person: the password hash never leaves the server. */
export function presentUser(user: User): PublicUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    siteIds: (user.sites ?? []).map((s) => s.id).sort((a, b) => a - b),
    clientId: user.clientId ?? null,
    organizationId: user.organizationId,
    createdAt: user.createdAt.toISOString(),
  }
}

/** The organisation as its people's screens need it; a missing row (a race with deletion) reads as defaults. */
export function presentOrganization(id: number, organization: Organization | null): PublicOrganization {
  return { id, name: organization?.name ?? '', clockStyle: organization?.clockStyle ?? '24h' }
}
