import type { PublicUser } from '@shared/schemas/auth'
import type { PublicSite } from '@shared/schemas/sites'
import type { PublicTank } from '@shared/schemas/tanks'
import type { Site, Tank, User } from '../models'

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null)

/** Public shapes only: password hashes and token hashes never leave the server. */
export function publicUser(user: User): PublicUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    siteIds: (user.sites ?? []).map((s) => s.id).sort((a, b) => a - b),
    organizationId: user.organizationId,
    createdAt: user.createdAt.toISOString(),
  }
}

export function publicSite(site: Site, tankCount = 0): PublicSite {
  return {
    id: site.id,
    name: site.name,
    timeZone: site.timeZone,
    address: site.address,
    notes: site.notes,
    archivedAt: iso(site.archivedAt),
    tankCount,
  }
}

export function publicTank(tank: Tank): PublicTank {
  return {
    id: tank.id,
    name: tank.name,
    siteId: tank.siteId,
    siteName: tank.site?.name ?? '',
    kind: tank.kind,
    stage: tank.stage,
    dimensions: tank.dimensions,
    volumeLitres: tank.volumeLitres,
    volumeSource: tank.volumeSource,
    substrateDepthCm: tank.substrateDepthCm,
    heater: tank.heater,
    filter: tank.filter,
    media: tank.media,
    lightSchedule: tank.lightSchedule,
    targets: tank.targets,
    notes: tank.notes,
    sortOrder: tank.sortOrder,
    archivedAt: iso(tank.archivedAt),
    createdAt: tank.createdAt.toISOString(),
    updatedAt: tank.updatedAt.toISOString(),
  }
}
