import { expect } from 'vitest'
import { bearer, sampleTank, startTestApp, type TestApp, type TestOrg } from '../helpers/app'

/** The care suites' app: the real one, every care route mounted by server/api-router.ts. */
export const startCareTestApp = () => startTestApp()

export type CareTestApp = TestApp

export const as = (org: TestOrg, role: 'owner' | 'keeper' | 'viewer') => bearer(org.users[role].token)

export async function newTank(t: CareTestApp, org: TestOrg, overrides: Record<string, unknown> = {}, siteId = org.siteIds[0] as number) {
  const res = await t
    .api()
    .post('/api/v1/tanks')
    .set(as(org, 'owner'))
    .send(sampleTank(siteId, { name: `Tank ${Math.random().toString(36).slice(2, 8)}`, ...overrides }))
  expect(res.status, JSON.stringify(res.body)).toBe(201)
  return res.body.id as number
}

export const isoDaysAgo = (days: number, from = Date.now()) => new Date(from - days * 86_400_000).toISOString()

/** The fields of a 400 answer. */
export function badFields(res: { status: number; body: { error?: { fields?: Record<string, string> } } }) {
  expect(res.status, JSON.stringify(res.body)).toBe(400)
  return Object.keys(res.body.error?.fields ?? {})
}
