import type { Role } from '@shared/schemas/auth'

/** A signed-in person. */
export type UserActor = {
  kind: 'user'
  userId: number
  organizationId: number
  role: Role
  /** Sites this actor may see; null means every site of the organization. */
  siteIds: number[] | null
  /** A client's viewer: the client and exactly its tanks (`siteIds` is then empty); absent for everyone else. */
  clientId?: number
  tankIds?: number[]
  sessionId: string
}

/** A wall display: read-only, one site, nothing but the wall. */
export type WallActor = {
  kind: 'wall'
  credentialId: number
  organizationId: number
  siteIds: number[]
  role: 'wall'
}

/** A sensor posting readings with its own token. */
export type DeviceActor = { kind: 'device'; deviceId: number; organizationId: number; tankId: number }

export type Actor = UserActor | WallActor

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace -- Express types the request through its global namespace; only merging into it adds our fields
  namespace Express {
    interface User {
      actor?: Actor
    }
    interface Request {
      actor?: Actor
      device?: DeviceActor
    }
  }
}
