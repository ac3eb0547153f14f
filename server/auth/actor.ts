import type { Role } from '../../shared/schemas/auth'
import type { DeviceActor } from './device-tokens'

/** Who is making a request. Device and wall-display actors join this union in later work. */
export type UserActor = {
  kind: 'user'
  userId: number
  organizationId: number
  role: Role
  /** Sites this actor may see; null means every site of the organization. */
  siteIds: number[] | null
  sessionId: string
}
export type Actor = UserActor

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
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
