import type { RequestHandler } from 'express'
import type { Passport } from 'passport'
import { forbidden, unauthenticated } from '../platform/errors'
import type { Actor, UserActor } from './actor'
import type { DeviceActor } from './actor'
import { roleAllows, type Permission } from './permissions'

/** Requires a valid user token; answers 401 in the API's error shape otherwise. */
export function authenticate(passport: InstanceType<typeof Passport>, strategies: string[] = ['user-jwt']): RequestHandler {
  return (req, res, next) => {
    passport.authenticate(strategies, { session: false }, (error: unknown, actor: Actor | false) => {
      if (error) return next(error)
      if (!actor) return next(unauthenticated('Sign in first, or sign in again: the token is missing, expired or revoked'))
      req.actor = actor
      next()
    })(req, res, next)
  }
}

export function allow(permission: Permission): RequestHandler {
  return (req, _res, next) => {
    if (!req.actor) return next(unauthenticated())
    if (!roleAllows(req.actor.role, permission)) return next(forbidden())
    next()
  }
}

/** The signed-in person; a wall display never reaches routes that ask for one. */
export function actorOf(req: { actor?: Actor }): UserActor {
  if (!req.actor) throw unauthenticated()
  if (req.actor.kind !== 'user') throw forbidden('A wall display can only show its wall')
  return req.actor
}

/** A person or a wall display, for the few read routes both may use. */
export function viewerOf(req: { actor?: Actor }): Actor {
  if (!req.actor) throw unauthenticated()
  return req.actor
}

/** Requires a device token (never a user token); sets `req.device`. */
export function authenticateDevice(passport: InstanceType<typeof Passport>): RequestHandler {
  return (req, res, next) => {
    passport.authenticate('device-token', { session: false }, (error: unknown, device: DeviceActor | false) => {
      if (error) return next(error)
      if (!device) return next(unauthenticated('A valid device token is required'))
      req.device = device
      next()
    })(req, res, next)
  }
}
