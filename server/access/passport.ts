import { Passport } from 'passport'
import type { Request } from 'express'
import { Strategy as BearerStrategy, type VerifyFunction } from 'passport-http-bearer'
import type { Models } from '../models'
import type { UserActor } from './actor'
import { verifyAccessToken } from './tokens'
import { deviceFromToken } from '../devices'
import { wallFromToken } from '../sites'

/**
 * Bearer tokens from the Authorization header only. passport-http-bearer also reads `access_token`
 * from the query and the body, where a token ends up in logs, browser history and Referer headers.
 */
class HeaderBearerStrategy extends BearerStrategy<VerifyFunction> {
  override authenticate(req: Request) {
    super.authenticate({ headers: req.headers } as Request)
  }
}

/**
 * One Passport instance per app. Each credential kind is its own named strategy:
 * 'user-jwt' for people, 'wall-token' for wall displays, 'device-token' for sensor nodes.
 */
export function createPassport(models: Models, jwtSecret: string) {
  const passport = new Passport()
  passport.use(
    'user-jwt',
    new HeaderBearerStrategy(async (token, done) => {
      try {
        done(null, (await userActorFromToken(models, jwtSecret, token)) ?? false)
      } catch (error) {
        done(error as Error)
      }
    }),
  )
  passport.use(
    'wall-token',
    new HeaderBearerStrategy(async (token, done) => {
      try {
        done(null, (await wallFromToken(models, token)) ?? false)
      } catch (error) {
        done(error as Error)
      }
    }),
  )
  passport.use(
    'device-token',
    new HeaderBearerStrategy(async (token, done) => {
      try {
        done(null, (await deviceFromToken(models, token)) ?? false)
      } catch (error) {
        done(error as Error)
      }
    }),
  )
  return passport
}

export async function userActorFromToken(models: Models, jwtSecret: string, token: string): Promise<UserActor | null> {
  const claims = verifyAccessToken(jwtSecret, token)
  if (!claims) return null
  return userActorOfSession(models, claims.jti, Number(claims.sub), claims.org)
}

/** The person behind a session as things stand now (role, sites), or null when it no longer holds. */
export async function userActorOfSession(models: Models, sessionId: string, userId: number, organizationId: number): Promise<UserActor | null> {
  const session = await models.Session.findByPk(sessionId)
  if (!session || session.revokedAt || session.expiresAt.getTime() <= Date.now()) return null
  const user = await models.User.findOne({
    where: { id: userId, organizationId },
    include: [{ association: 'sites', attributes: ['id'] }],
  })
  if (!user || !user.active || session.userId !== user.id) return null
  const base = { kind: 'user' as const, userId: user.id, organizationId: user.organizationId, role: user.role, sessionId: session.id }
  if (user.role === 'viewer' && user.clientId) {
    const tanks = await models.Tank.findAll({ where: { clientId: user.clientId, organizationId: user.organizationId }, attributes: ['id'] })
    return { ...base, siteIds: [], clientId: user.clientId, tankIds: tanks.map((t) => t.id) }
  }
  const siteIds = user.role === 'viewer' && user.sites?.length ? user.sites.map((s) => s.id) : null
  return { ...base, siteIds }
}
