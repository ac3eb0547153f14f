import type { Test } from 'supertest'
import { bearer, type TestApp, type TestOrg } from './app'

// One feature's role table: each row is a route, what an owner, a keeper, a viewer and another
// organization's owner get, and how to make a fresh path (and body) for it; a caller without a
// token always gets 401. tests/api/route-roles.test.ts holds every route against every kind of
// caller with minimal fixtures; a feature's table goes through its own fixtures.

export type Caller = 'owner' | 'keeper' | 'viewer' | 'otherOrg' | 'noToken'
export const CALLERS: readonly Caller[] = ['owner', 'keeper', 'viewer', 'otherOrg', 'noToken']

/** Owner, keeper, viewer, another organization's owner. */
export const readable = [200, 200, 200, 404]
export const writers = (ok: number) => [ok, ok, 403, 404]
export const ownerOnly = (ok: number) => [ok, 403, 403, 404]

export type Prepared = { path: string; body?: object }
export type RoleRow<P = Prepared> = [method: string, route: string, expected: number[], prepare: () => Promise<P>]

/** One case a row and a caller, for `it.each`: `'$method $route as $caller → $status'`. */
export const roleCases = <P>(rows: RoleRow<P>[]) =>
  rows.flatMap(([method, route, expected, prepare]) =>
    CALLERS.map((caller, i) => ({ method, route, caller, status: caller === 'noToken' ? 401 : (expected[i] as number), prepare })),
  )

/** The caller's token: `org`'s user of that role, `other`'s owner, or none. */
export const tokenOf = (caller: Caller, org: TestOrg, other: TestOrg) =>
  caller === 'otherOrg' ? other.users.owner.token : caller === 'noToken' ? null : org.users[caller].token

/** `method` on `/api/v1<path>` with the token, if any; send a body or attach a file before awaiting it. */
export function requestAs(t: Pick<TestApp, 'api'>, method: string, path: string, token: string | null): Test {
  const req = (t.api() as unknown as Record<string, (p: string) => Test>)[method]!(`/api/v1${path}`)
  return token ? req.set(bearer(token)) : req
}

/** Sends a prepared case as the caller and answers the response. */
export async function callAs(t: Pick<TestApp, 'api'>, method: string, prepared: Prepared, token: string | null) {
  const req = requestAs(t, method, prepared.path, token)
  return prepared.body ? req.send(prepared.body) : req
}
