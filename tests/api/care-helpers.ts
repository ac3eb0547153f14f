import express, { Router } from 'express'
import request from 'supertest'
import { expect } from 'vitest'
import { createPassport } from '../../server/access/passport'
import { authenticate } from '../../server/access/middleware'
import { errorHandler } from '../../server/platform/http/errors'
import { careRouter, careRoutes, siteCareRoutes } from '../../server/care/routes'
import { bearer, sampleTank, startTestApp, type TestOrg } from '../helpers/app'

/**
 * The test app for the care suites. Once server/api-router.ts mounts the care routes, the
 * real app answers them and is used as is; until then the same routers are mounted here, in
 * front of it, exactly as index.ts is meant to mount them.
 */
export async function startCareTestApp() {
  const t = await startTestApp()
  const probeOrg = await t.createOrg('Care probe org')
  const mounted = (await request(t.app).get('/api/v1/care/species').set(bearer(probeOrg.users.owner.token))).status === 200
  let app: express.Express | typeof t.app = t.app
  if (!mounted) {
    const requireUser = authenticate(createPassport(t.ctx.models, t.ctx.config.jwtSecret))
    const care = Router()
    care.use('/tanks', requireUser, careRoutes(t.ctx))
    care.use('/sites', requireUser, siteCareRoutes(t.ctx))
    care.use(['/care-tasks', '/water-changes', '/treatment-courses', '/care'], requireUser)
    care.use(careRouter(t.ctx))
    const wrapper = express()
    wrapper.use('/api/v1', express.json(), care)
    wrapper.use(t.app)
    wrapper.use(errorHandler(t.ctx.logger))
    app = wrapper
  }
  return { ...t, mounted, api: () => request(app) }
}

export type CareTestApp = Awaited<ReturnType<typeof startCareTestApp>>

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
