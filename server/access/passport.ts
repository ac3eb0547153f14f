import { Passport } from 'passport'
import type { Request } from 'express'
import { QueryTypes } from 'sequelize'
import type { Role } from '@shared/schemas/auth'
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

/*
 * The session, its person, the person's sites and a client's tanks in one round trip: every request
 * of a person runs it, so it is one query on primary keys instead of three through the models.
 */
const SESSION_ACTOR_SQL = `
SELECT s.id AS session_id, u.id, u.organization_id, u.role, u.client_id,
  ARRAY(SELECT us.site_id FROM user_sites us WHERE us.user_id = u.id ORDER BY 1) AS site_ids,
  CASE WHEN u.role = 'viewer' AND u.client_id IS NOT NULL
    THEN ARRAY(SELECT t.id FROM tanks t WHERE t.client_id = u.client_id AND t.organization_id = u.organization_id ORDER BY 1)
  END AS tank_ids
FROM sessions s JOIN users u ON u.id = s.user_id
WHERE s.id = $1::uuid AND s.revoked_at IS NULL AND s.expires_at > $4::timestamptz
  AND u.id = $2 AND u.organization_id = $3 AND u.active`

type SessionActorRow = {
  session_id: string
  id: number
  organization_id: number
  role: Role
  client_id: number | null
  site_ids: number[]
  tank_ids: number[] | null
}

/** The person behind a session as things stand now (role, sites), or null when it no longer holds. */
export async function userActorOfSession(models: Models, sessionId: string, userId: number, organizationId: number): Promise<UserActor | null> {
  const [row] = await models.Session.sequelize!.query<SessionActorRow>(SESSION_ACTOR_SQL, {
    bind: [sessionId, userId, organizationId, new Date()],
    type: QueryTypes.SELECT,
  })
  if (!row) return null
  const base = { kind: 'user' as const, userId: row.id, organizationId: row.organization_id, role: row.role, sessionId: row.session_id }
  if (row.tank_ids) return { ...base, siteIds: [], clientId: row.client_id!, tankIds: row.tank_ids }
  const siteIds = row.role === 'viewer' && row.site_ids.length ? row.site_ids : null
  return { ...base, siteIds }
}
