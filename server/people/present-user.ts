import type { PublicUser } from '@shared/schemas/auth'
import type { User } from '../models'

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
