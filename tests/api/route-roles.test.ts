import { randomUUID } from 'node:crypto'
import jwt from 'jsonwebtoken'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { authService } from '../../server/people/auth'
import { tanksService } from '../../server/tanks/tanks'
import { testKitService } from '../../server/test-kit/test-kit'
import { treatmentCoursesService } from '../../server/care/treatment-courses'
import { treatmentCourseInputSchema } from '@shared/schemas/treatment'
import { usersService } from '../../server/people/users'
import { ackLinksService } from '../../server/incidents/ack-links'
import { rosterService } from '../../server/roster/roster'
import { wallService } from '../../server/sites/wall'
import { tankInputSchema } from '@shared/schemas/tanks'
import { bearer, sampleTank, startTestApp, TEST_PASSWORD, type TestOrg } from '../helpers/app'
import { createIncidentRow } from '../helpers/fixtures'

const JWT_SECRET = 'test-secret-that-is-long-enough-for-hs256-signing'
// `wall` holds a valid wall display key for the organization's first site; `clientViewer` is a
// client's person, a viewer of exactly that client's one tank (never the fresh rows a case makes).
const CALLERS = ['owner', 'keeper', 'viewer', 'clientViewer', 'noToken', 'expired', 'tampered', 'algNone', 'otherOrg', 'wall'] as const
type Caller = (typeof CALLERS)[number]
type Expected = Record<Caller, number>
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete'

/** Everything a case may need, created fresh per case so one case's writes never decide another's status. */
type World = {
  org: TestOrg
  freshEmail(): string
  freshTank(archived?: boolean): Promise<number>
  freshSite(archived?: boolean): Promise<number>
  freshInvitation(): Promise<{ id: number; token: string }>
  freshUser(): Promise<number>
  freshDevice(): Promise<number>
  freshSiteRule(): Promise<number>
  freshTankRule(): Promise<number>
  freshSnooze(): Promise<number>
  freshMaintenanceWindow(): Promise<number>
  freshIncident(): Promise<number>
  freshAckToken(): Promise<string>
  freshShift(siteId: number): Promise<number>
  freshOverride(siteId: number): Promise<number>
  freshWallKey(): Promise<{ id: number; key: string }>
  freshMail(): Promise<number>
  freshClient(): Promise<number>
  freshVisit(): Promise<number>
  /** A notification device of the org's owner. */
  freshPushDevice(): Promise<number>
}

/** What one case sends: the values for the route's `:params` (in order) and the body, all made fresh per case. */
type Prepared = { param?: number | string | Array<number | string>; query?: string; body?: unknown }
type RouteCase = { method: Method; route: string; expected: Expected; prepare: (w: World) => Promise<Prepared> | Prepared }

/** Open routes: the secret is in the path or body, so any token (a wall key too) changes nothing. */
const everyone = (status: number) => Object.fromEntries(CALLERS.map((c) => [c, status])) as Expected
/**
 * `otherOrg` is the owner of another organization: the strongest role, so only tenancy can stop it.
 * `clientViewer` defaults from the viewer (see `row`) unless given.
 */
const signedIn = (owner: number, keeper: number, viewer: number, otherOrg: number, clientViewer = NaN): Expected => ({
  owner,
  keeper,
  viewer,
  clientViewer,
  otherOrg,
  noToken: 401,
  expired: 401,
  tampered: 401,
  algNone: 401,
  wall: 401,
})
/**
 * A client's viewer has the viewer's permissions over fewer rows: where a viewer reads a row a case
 * made fresh (a tank, a site, an incident…), the client's viewer is told it does not exist.
 */
const clientViewerOf = (route: string, viewer: number) => (viewer === 200 && route.includes('/:') ? 404 : viewer)
const row = (method: Method, route: string, expected: Expected, prepare: RouteCase['prepare'] = () => ({})): RouteCase => ({
  method,
  route,
  expected: Number.isNaN(expected.clientViewer) ? { ...expected, clientViewer: clientViewerOf(route, expected.viewer) } : expected,
  prepare,
})
const ownerOnly = signedIn(200, 403, 403, 404)
const ownerCreates = signedIn(201, 403, 403, 404)
const ownerDeletes = signedIn(204, 403, 403, 404)
const readable = signedIn(200, 200, 200, 404)
const handlers = signedIn(200, 200, 403, 404)
const HOUR = 3600_000
const EXPORT_RANGE = 'from=2026-03-01T00:00:00Z&to=2026-04-01T00:00:00Z'
const inHours = (h: number) => new Date(Date.now() + h * HOUR).toISOString()
const ruleBody = { name: 'pH below 6.5', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.5 } }
const storedRule = { name: 'pH below 6.5', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.5, holdMinutes: 0, clearMargin: 0 } } as const
const maintenanceBody = { reason: 'Weekly glass polish', repeat: 'weekly', weekday: 1, start: '09:00', durationMinutes: 90 }
const snoozeBody = () => ({ reason: 'Water change', startsAt: inHours(0), endsAt: inHours(2) })
let pushCounter = 0
/** A browser's subscription: a fresh endpoint, a P-256 point (65 bytes) and a 16-byte auth secret. */
const pushDeviceBody = () => ({
  endpoint: `https://push.example/send/${process.pid}-${++pushCounter}`,
  keys: { p256dh: Buffer.alloc(65, 4).toString('base64url'), auth: Buffer.alloc(16, 7).toString('base64url') },
  label: 'Roles phone',
})
const probe = async (w: World) => ({ tankId: await w.freshTank(), name: 'Probe', metrics: ['temperature'], intervalSeconds: 60 })

const kitBody = { values: [{ metric: 'ph', value: 7.1, unit: 'pH' }], notes: 'weekly check' }
async function keepersEntry(w: World) {
  const tankId = await w.freshTank()
  const keeper = await t.ctx.models.User.findByPk(w.org.users.keeper.id)
  const actor: UserActor = { kind: 'user', userId: keeper!.id, organizationId: keeper!.organizationId, role: 'keeper', siteIds: null, sessionId: randomUUID() }
  const entry = await testKitService(t.ctx).create(actor, tankId, { values: kitBody.values as never, notes: '' })
  return entry.id
}

/** A batch of fish in a fresh tank of the organization's first site. */
async function freshBatch(w: World) {
  const tankId = await w.freshTank()
  const batch = await t.ctx.models.LivestockEntry.create({
    organizationId: w.org.organizationId,
    tankId,
    speciesKey: null,
    name: 'Ember tetra',
    category: 'fish',
    count: 10,
    addedAt: new Date(),
  })
  return batch.id
}

async function freshEquipment(w: World) {
  const tankId = await w.freshTank()
  const row = await t.ctx.models.Equipment.create({
    organizationId: w.org.organizationId,
    tankId,
    kind: 'pump',
    name: 'Return pump',
    installedOn: '2026-01-05',
    serviceAction: 'service',
    serviceEveryDays: 91,
  })
  return row.id
}
async function freshConsumable(w: World) {
  const row = await t.ctx.models.Consumable.create({
    organizationId: w.org.organizationId,
    siteId: w.org.siteIds[0] as number,
    kind: 'salt',
    name: 'Salt',
    unit: 'kg',
    quantity: 10,
  })
  return row.id
}

const courseBody = { product: 'Copper treatment', dose: { amount: 1, unit: 'mL', perLitres: 10 }, days: 14, tests: [{ metric: 'copper', timesPerDay: 2 }] }

async function freshCourse(w: World) {
  const tankId = await w.freshTank()
  const keeper = await t.ctx.models.User.findByPk(w.org.users.keeper.id)
  const actor: UserActor = { kind: 'user', userId: keeper!.id, organizationId: keeper!.organizationId, role: 'keeper', siteIds: null, sessionId: randomUUID() }
  return (await treatmentCoursesService(t.ctx).start(actor, tankId, treatmentCourseInputSchema.parse(courseBody))).id
}

/** The care routes have their role matrix in care-roles.test.ts (owner, keeper, viewer, other org, no token). */
const CHECKED_IN_CARE_ROLES = [
  'GET /tanks/:id/care-tasks',
  'POST /tanks/:id/care-tasks',
  'GET /tanks/:id/care-log',
  'POST /tanks/:id/care-log',
  'GET /tanks/:id/water-changes',
  'POST /tanks/:id/water-changes/plan',
  'POST /tanks/:id/water-changes',
  'GET /tanks/:id/livestock',
  'POST /tanks/:id/livestock',
  'PATCH /tanks/:id/livestock/:entryId',
  'GET /tanks/:id/cycling',
  'PATCH /care-tasks/:id',
  'POST /care-tasks/done',
  'POST /care-tasks/:id/done',
  'POST /care-tasks/:id/snooze',
  'POST /water-changes/:id/finish',
  'POST /water-changes/:id/cancel',
  'GET /care/today',
  'GET /care/species',
  'GET /sites/:id/care-summary',
]

/** The photo routes have their role matrix in photos-access.test.ts (owner, keeper, viewer, other org, no token). */
const CHECKED_IN_PHOTO_ROLES = [
  'GET /tanks/:id/photos',
  'POST /tanks/:id/photos',
  'GET /photos/:id',
  'GET /photos/:id/image',
  'GET /photos/:id/thumbnail',
  'DELETE /photos/:id',
]
/** The report routes have their role matrix in report-roles.test.ts (owner, keeper, viewer, other org, no token). */
const CHECKED_IN_REPORT_ROLES = [
  'GET /tanks/:id/report',
  'GET /tanks/:id/report/pdf',
  'GET /sites/:id/report',
  'GET /sites/:id/report/pdf',
  'GET /report-schedules',
  'POST /report-schedules',
  'PATCH /report-schedules/:id',
  'DELETE /report-schedules/:id',
  'POST /report-schedules/:id/send-now',
]
/** The build routes have their role matrix in build-roles.test.ts (a plan, a fill and a step need their own set-up). */
const CHECKED_IN_BUILD_ROLES = [
  'GET /tanks/:id/build',
  'PUT /tanks/:id/build/plan',
  'POST /tanks/:id/build/start',
  'POST /tanks/:id/build/steps/:key/done',
  'GET /tanks/:id/build/templates',
  'GET /tanks/:id/build/report/pdf',
  'POST /tanks/:id/build/report/mail',
]
/** The CSV import routes have their role matrix in import-roles.test.ts (multipart uploads need their own set-up). */
const CHECKED_IN_IMPORT_ROLES = [
  'POST /tanks/:id/imports',
  'POST /sites/:id/imports',
  'GET /imports/:id',
  'POST /imports/:id/start',
  'POST /imports/:id/cancel',
  'GET /imports/:id/rejections',
  'GET /import-sources',
]

/** One row per route the API serves. A new route adds a row here; the coverage test below insists. */
const ROUTES: RouteCase[] = [
  row('get', '/health', everyone(200)),
  row('post', '/auth/sign-in', everyone(200), (w) => ({ body: { email: w.org.users.keeper.email, password: TEST_PASSWORD } })),
  row('post', '/auth/sign-out', signedIn(204, 204, 204, 204)),
  // Same answer for every caller; the address need not exist.
  row('post', '/auth/password-reset', everyone(202), () => ({ body: { email: 'someone@nowhere.example' } })),
  row('post', '/auth/password-reset/confirm', everyone(400), () => ({ body: { token: 'x'.repeat(43), password: 'a-long-enough-password' } })),
  row('get', '/auth/me', signedIn(200, 200, 200, 200)),
  // Setup is open to anyone until the first business exists; here one does, so every caller is refused alike.
  row('get', '/setup', everyone(200)),
  row('post', '/setup', everyone(409), (w) => ({
    body: { businessName: 'Late', ownerName: 'Late Owner', email: w.freshEmail(), password: 'long-enough-password', siteName: 'Late site', timeZone: 'UTC' },
  })),
  // Each owner has their own organisation's checklist, so another organisation's owner is answered too.
  row('get', '/setup/checklist', signedIn(200, 403, 403, 200)),
  row('post', '/setup/checklist/:step/dismiss', signedIn(204, 403, 403, 204), () => ({ param: 'wall' })),
  // Everyone sees their own organisation's overview, so another organisation's owner gets 200 too.
  row('get', '/overview', signedIn(200, 200, 403, 200)),
  row('post', '/auth/password', signedIn(204, 204, 204, 204), () => ({
    body: { currentPassword: TEST_PASSWORD, newPassword: TEST_PASSWORD },
  })),
  row('get', '/invitations/:token', everyone(200), async (w) => ({ param: (await w.freshInvitation()).token })),
  row('post', '/invitations/accept', everyone(201), async (w) => ({
    body: { token: (await w.freshInvitation()).token, password: 'a-long-enough-password' },
  })),
  row('get', '/users', signedIn(200, 403, 403, 200)),
  row('get', '/users/invitations', signedIn(200, 403, 403, 200)),
  row('post', '/users/invitations', signedIn(201, 403, 403, 201), (w) => ({
    body: { email: w.freshEmail(), name: 'New keeper', role: 'keeper' },
  })),
  row('delete', '/users/invitations/:id', signedIn(204, 403, 403, 404), async (w) => ({ param: (await w.freshInvitation()).id })),
  // Each owner changes their own organisation, so another organisation's owner is answered too.
  row('patch', '/organization', signedIn(200, 403, 403, 200), () => ({ body: { clockStyle: '24h' } })),
  row('patch', '/users/:id', ownerOnly, async (w) => ({ param: await w.freshUser(), body: { name: 'Renamed keeper' } })),
  row('get', '/sites', signedIn(200, 200, 200, 200)),
  row('get', '/sites/:id', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites', signedIn(201, 403, 403, 201), () => ({ body: { name: 'Back room', timeZone: 'Europe/Paris' } })),
  row('patch', '/sites/:id', ownerOnly, async (w) => ({ param: await w.freshSite(), body: { name: 'Renamed site' } })),
  row('post', '/sites/:id/archive', ownerOnly, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/unarchive', ownerOnly, async (w) => ({ param: await w.freshSite(true) })),
  row('get', '/tanks', signedIn(200, 200, 200, 200)),
  row('get', '/tanks/:id', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshTank() })),
  row('get', '/tanks/:id/treatment-courses', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/treatment-courses', signedIn(201, 201, 403, 404), async (w) => ({ param: await w.freshTank(), body: courseBody })),
  row('post', '/treatment-courses/:id/stop', signedIn(200, 200, 403, 404), async (w) => ({ param: await freshCourse(w) })),
  // The other organization's owner names this organization's site: for them that site does not exist.
  row('post', '/tanks', signedIn(201, 201, 403, 400), (w) => ({ body: sampleTank(w.org.siteIds[0]) })),
  row('patch', '/tanks/:id', signedIn(200, 200, 403, 404), async (w) => ({ param: await w.freshTank(), body: { stage: 'quarantine' } })),
  row('post', '/tanks/:id/archive', ownerOnly, async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/unarchive', ownerOnly, async (w) => ({ param: await w.freshTank(true) })),
  // A sheet naming this organisation's site: to another organisation that site does not exist (400).
  row('post', '/tanks/import', signedIn(201, 201, 403, 400), async (w) => {
    const site = await t.ctx.models.Site.findByPk(w.org.siteIds[0])
    return { body: { csv: `name,site,kind,volume\nRow ${w.freshEmail()},${site!.name},marine,120\n` } }
  }),
  row('post', '/tanks/:id/duplicate', signedIn(201, 201, 403, 404), async (w) => ({ param: await w.freshTank(), body: { count: 1 } })),
  row('get', '/tanks/:id/series', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshTank(), query: 'metric=temperature' })),
  row('get', '/tanks/:id/latest', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshTank() })),
  row('get', '/devices', signedIn(200, 200, 200, 200)),
  row('get', '/devices/:id', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshDevice() })),
  // Here a foreign tank in the body answers 404 (the devices service looks the tank up like a detail route).
  row('post', '/devices', signedIn(201, 403, 403, 404), async (w) => ({ body: await probe(w) })),
  row('patch', '/devices/:id', ownerOnly, async (w) => ({ param: await w.freshDevice(), body: { name: 'Renamed probe' } })),
  row('post', '/devices/:id/rotate', ownerOnly, async (w) => ({ param: await w.freshDevice() })),
  row('post', '/devices/:id/revoke', ownerOnly, async (w) => ({ param: await w.freshDevice() })),
  row('get', '/devices/:id/calibrations', readable, async (w) => ({ param: await w.freshDevice() })),
  row('post', '/devices/:id/calibrations', signedIn(201, 201, 403, 404), async (w) => ({
    param: await w.freshDevice(),
    body: { metric: 'temperature', referenceC: 25.3, reading: 25 },
  })),
  row('get', '/tanks/:id/test-kit-entries', signedIn(200, 200, 200, 404), async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/test-kit-entries', signedIn(201, 201, 403, 404), async (w) => ({ param: await w.freshTank(), body: kitBody })),
  // Entries are made by the keeper: only their author may change them, within the edit window.
  row('put', '/test-kit-entries/:id', signedIn(403, 200, 403, 404), async (w) => ({ param: await keepersEntry(w), body: kitBody })),
  row('delete', '/test-kit-entries/:id', signedIn(403, 204, 403, 404), async (w) => ({ param: await keepersEntry(w) })),
  row('get', '/test-kit-entries/:id/history', signedIn(200, 200, 200, 404), async (w) => ({ param: await keepersEntry(w) })),
  // A person's token, however valid, is never a device token.
  row('post', '/readings', everyone(401), () => ({ body: { readings: [] } })),

  row('get', '/tanks/:id/rules', readable, async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/rules', ownerCreates, async (w) => ({ param: await w.freshTank(), body: ruleBody })),
  row('put', '/tanks/:id/rules/:ruleId/override', ownerOnly, async (w) => ({
    param: [await w.freshTank(), await w.freshSiteRule()],
    body: { enabled: false },
  })),
  row('get', '/sites/:id/rules', readable, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/rules', ownerCreates, async (w) => ({ param: await w.freshSite(), body: ruleBody })),
  row('patch', '/rules/:id', ownerOnly, async (w) => ({ param: await w.freshTankRule(), body: { enabled: false } })),
  row('delete', '/rules/:id', ownerDeletes, async (w) => ({ param: await w.freshTankRule() })),
  row('get', '/tanks/:id/snoozes', readable, async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/snoozes', signedIn(201, 201, 403, 404), async (w) => ({ param: await w.freshTank(), body: snoozeBody() })),
  row('post', '/snoozes/:id/cancel', handlers, async (w) => ({ param: await w.freshSnooze() })),
  row('get', '/sites/:id/maintenance-windows', readable, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/maintenance-windows', signedIn(201, 201, 403, 404), async (w) => ({ param: await w.freshSite(), body: maintenanceBody })),
  row('post', '/maintenance-windows/:id/cancel', handlers, async (w) => ({ param: await w.freshMaintenanceWindow() })),
  row('get', '/incidents', signedIn(200, 200, 200, 200)),
  row('get', '/livestock/batches', signedIn(200, 200, 200, 200)),
  row('get', '/livestock/batches/:id', readable, async (w) => ({ param: await freshBatch(w) })),
  row('post', '/livestock/batches/:id/move', handlers, async (w) => ({ param: await freshBatch(w), body: { toTankId: await w.freshTank(), confirm: true } })),
  row('post', '/livestock/batches/:id/losses', handlers, async (w) => ({ param: await freshBatch(w), body: { count: 1, cause: 'jumped' } })),
  row('post', '/livestock/batches/:id/out', handlers, async (w) => ({ param: await freshBatch(w), body: { outcome: 'sold', count: 2 } })),
  row('get', '/livestock/stock', signedIn(200, 200, 200, 200)),
  row('get', '/tanks/:id/equipment', readable, async (w) => ({ param: await w.freshTank() })),
  row('post', '/tanks/:id/equipment', signedIn(201, 201, 403, 404), async (w) => ({
    param: await w.freshTank(),
    body: { kind: 'lamp', name: 'Lamp', installedOn: '2026-01-05' },
  })),
  row('patch', '/equipment/:id', handlers, async (w) => ({ param: await freshEquipment(w), body: { serviceEveryDays: 60 } })),
  row('post', '/equipment/:id/replace', handlers, async (w) => ({ param: await freshEquipment(w), body: { notes: 'new impeller' } })),
  row('get', '/sites/:id/consumables', readable, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/consumables', signedIn(201, 201, 403, 404), async (w) => ({
    param: await w.freshSite(),
    body: { kind: 'salt', name: 'Salt', unit: 'kg', quantity: 10 },
  })),
  row('patch', '/consumables/:id', handlers, async (w) => ({ param: await freshConsumable(w), body: { quantity: 4 } })),
  row('get', '/livestock/stock.csv', signedIn(200, 200, 200, 200)),
  row('get', '/incidents/:id', readable, async (w) => ({ param: await w.freshIncident() })),
  row('post', '/incidents/:id/acknowledge', handlers, async (w) => ({ param: await w.freshIncident(), body: { note: 'On it' } })),
  row('post', '/incidents/:id/resolve', handlers, async (w) => ({ param: await w.freshIncident(), body: { note: 'Heater replaced' } })),
  row('get', '/ack-links/:token', everyone(200), async (w) => ({ param: await w.freshAckToken() })),
  row('post', '/ack-links/use', everyone(200), async (w) => ({ body: { token: await w.freshAckToken() } })),
  row('get', '/sites/:id/roster/shifts', readable, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/roster/shifts', ownerCreates, async (w) => ({
    param: await w.freshSite(),
    body: { userId: w.org.users.keeper.id, weekday: 0, start: '08:00', end: '16:00' },
  })),
  row('patch', '/sites/:id/roster/shifts/:shiftId', ownerOnly, async (w) => {
    const site = await w.freshSite()
    return { param: [site, await w.freshShift(site)], body: { end: '17:00' } }
  }),
  row('delete', '/sites/:id/roster/shifts/:shiftId', ownerDeletes, async (w) => {
    const site = await w.freshSite()
    return { param: [site, await w.freshShift(site)] }
  }),
  row('get', '/sites/:id/roster/overrides', readable, async (w) => ({ param: await w.freshSite() })),
  row('post', '/sites/:id/roster/overrides', ownerCreates, async (w) => ({
    param: await w.freshSite(),
    body: { userId: w.org.users.keeper.id, kind: 'add', startsAt: inHours(1), endsAt: inHours(5) },
  })),
  row('delete', '/sites/:id/roster/overrides/:overrideId', ownerDeletes, async (w) => {
    const site = await w.freshSite()
    return { param: [site, await w.freshOverride(site)] }
  }),
  row('get', '/sites/:id/roster/on-duty', readable, async (w) => ({ param: await w.freshSite() })),
  row('get', '/sites/:id/roster/week', readable, async (w) => ({ param: await w.freshSite(), query: 'start=2026-03-02' })),
  row('put', '/sites/:id/roster/backup', ownerOnly, async (w) => ({ param: await w.freshSite(), body: { userId: w.org.users.keeper.id } })),
  // The two routes a wall key opens: the wall of its own site, and its trend lines page by page.
  row('get', '/sites/:id/wall', { ...readable, wall: 200 }, (w) => ({ param: w.org.siteIds[0] })),
  row('get', '/sites/:id/wall/trends', { ...readable, wall: 200 }, async (w) => ({ param: w.org.siteIds[0], query: `tankIds=${await w.freshTank()}` })),
  row('get', '/sites/:id/wall-credentials', ownerOnly, async (w) => ({ param: await w.freshSite() })),
  row('get', '/sites/:id/labels.pdf', ownerOnly, async (w) => ({ param: await w.freshSite(), query: 'paper=letter&size=large' })),
  row('post', '/sites/:id/wall-credentials', ownerCreates, async (w) => ({ param: await w.freshSite(), body: { name: 'Shop TV' } })),
  row('post', '/wall-credentials/:id/revoke', ownerOnly, async (w) => ({ param: (await w.freshWallKey()).id })),
  // The box is shared by every organization: the other owner sees and clears only their own mail.
  row('get', '/dev/mail', signedIn(200, 403, 403, 200)),
  row('get', '/dev/mail/:id', ownerOnly, async (w) => ({ param: await w.freshMail() })),
  row('delete', '/dev/mail', signedIn(204, 403, 403, 204)),
  // Exports: every role reads what it can see; the backup belongs to each owner's own organization.
  ...(['readings', 'incidents', 'care-log'] as const).flatMap((kind) => [
    row('get', `/tanks/:id/exports/${kind}.csv`, readable, async (w) => ({ param: await w.freshTank(), query: EXPORT_RANGE })),
    row('get', `/sites/:id/exports/${kind}.csv`, readable, async (w) => ({ param: await w.freshSite(), query: EXPORT_RANGE })),
  ]),
  // Clients: staff read them, owners keep them; each owner sees only their own organization's list.
  row('get', '/clients', signedIn(200, 200, 403, 200)),
  row('get', '/clients/:id', signedIn(200, 200, 403, 404), async (w) => ({ param: await w.freshClient() })),
  row('post', '/clients', signedIn(201, 403, 403, 201), () => ({ body: { kind: 'company', name: 'Harbour Dental' } })),
  row('patch', '/clients/:id', ownerOnly, async (w) => ({ param: await w.freshClient(), body: { phone: '+49 30 1234' } })),
  row('post', '/clients/:id/archive', ownerOnly, async (w) => ({ param: await w.freshClient() })),
  row('post', '/clients/:id/unarchive', ownerOnly, async (w) => ({ param: await w.freshClient() })),
  // A client's report: anyone who may read reports and see every site; another client's person is told it does not exist.
  row('get', '/clients/:id/report', readable, async (w) => ({ param: await w.freshClient() })),
  row('get', '/clients/:id/report/pdf', readable, async (w) => ({ param: await w.freshClient() })),
  // Visits: owners plan, the technician (here the keeper) works them; viewers read closed ones only, so a planned one is not there for them.
  row('get', '/visits', signedIn(200, 200, 200, 200)),
  row('post', '/visits', signedIn(201, 403, 403, 400), async (w) => {
    const clientId = await w.freshClient()
    const tank = await t.ctx.models.Tank.findOne({ where: { clientId } })
    return {
      body: { clientId, siteId: tank!.siteId, technicianId: w.org.users.keeper.id, startsAt: inHours(1), endsAt: inHours(2), tankIds: [tank!.id] },
    }
  }),
  row('get', '/visits/:id', signedIn(200, 200, 404, 404), async (w) => ({ param: await w.freshVisit() })),
  row('patch', '/visits/:id', ownerOnly, async (w) => ({ param: await w.freshVisit(), body: { notes: 'Bring a spare heater' } })),
  row('delete', '/visits/:id', ownerDeletes, async (w) => ({ param: await w.freshVisit() })),
  row('post', '/visits/:id/start', handlers, async (w) => ({ param: await w.freshVisit() })),
  row('post', '/visits/:id/close', handlers, async (w) => ({ param: await w.freshVisit(), body: {} })),
  row('get', '/visits/:id/report/pdf', signedIn(200, 200, 404, 404), async (w) => ({ param: await w.freshVisit() })),
  row('get', '/rounds', signedIn(200, 200, 403, 200)),
  row('get', '/backup', signedIn(200, 403, 403, 200)),
  // No file sent: an owner reaches the upload check (400), others stop at the role.
  row('post', '/backup/restore', signedIn(400, 403, 403, 400)),

  // One's own notification devices: another person's device is not found, whoever asks.
  row('get', '/push/config', signedIn(200, 200, 200, 200)),
  row('get', '/push/subscriptions', signedIn(200, 200, 200, 200)),
  row('post', '/push/subscriptions', signedIn(201, 201, 201, 201), () => ({ body: pushDeviceBody() })),
  row('delete', '/push/subscriptions/:id', signedIn(204, 404, 404, 404), async (w) => ({ param: await w.freshPushDevice() })),
  row('post', '/push/subscriptions/:id/test', signedIn(202, 404, 404, 404), async (w) => ({ param: await w.freshPushDevice() })),
  row('get', '/push/channels', signedIn(200, 200, 200, 200)),
  row('put', '/push/channels', signedIn(200, 200, 200, 200), () => ({ body: { warning: 'mail', alarm: 'both' } })),
]

const ERROR_CODES: Record<number, string> = { 400: 'invalid_input', 401: 'unauthenticated', 403: 'forbidden', 404: 'not_found' }
const CASES = ROUTES.flatMap((r) =>
  CALLERS.map((caller) => ({ ...r, caller, status: r.expected[caller], name: `${r.method.toUpperCase()} ${r.route} as ${caller}` })),
)

let t: Awaited<ReturnType<typeof startTestApp>>
let org: TestOrg
let other: TestOrg
let world: World
let emailCounter = 0
let clientViewerId = 0

const ownerActor = (o: TestOrg): UserActor => ({
  kind: 'user',
  userId: o.users.owner.id,
  organizationId: o.organizationId,
  role: 'owner',
  siteIds: null,
  sessionId: randomUUID(),
})

async function freshToken(userId: number) {
  const user = await t.ctx.models.User.findByPk(userId, { include: [{ association: 'sites' }] })
  return (await authService(t.ctx).openSession(user!)).token
}

/** A live session row, so a forged token for it fails on the token alone and not on a missing session. */
async function liveSessionId(userId: number) {
  const id = randomUUID()
  await t.ctx.models.Session.create({ id, userId, expiresAt: new Date(Date.now() + 3600_000) })
  return id
}

const base64url = (value: object) => Buffer.from(JSON.stringify(value)).toString('base64url')

async function ownerClaims() {
  return { sub: String(org.users.owner.id), org: org.organizationId, typ: 'user', jti: await liveSessionId(org.users.owner.id) }
}

async function tokenFor(caller: Caller): Promise<string | null> {
  switch (caller) {
    case 'noToken':
      return null
    case 'owner':
    case 'keeper':
    case 'viewer':
      return freshToken(org.users[caller].id)
    case 'clientViewer':
      return freshToken(clientViewerId)
    case 'otherOrg':
      return freshToken(other.users.owner.id)
    case 'wall':
      return (await world.freshWallKey()).key
    case 'tampered': {
      const [header, payload, signature] = (await freshToken(org.users.owner.id)).split('.')
      // The first character carries the top six bits of the first byte, so the signature really changes.
      return `${header}.${payload}.${signature[0] === 'A' ? 'B' : 'A'}${signature.slice(1)}`
    }
    case 'expired': {
      const { sub, jti, ...rest } = await ownerClaims()
      return jwt.sign(rest, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: -60 })
    }
    case 'algNone': {
      const now = Math.floor(Date.now() / 1000)
      const claims = { ...(await ownerClaims()), iat: now, exp: now + 3600 }
      return `${base64url({ alg: 'none', typ: 'JWT' })}.${base64url(claims)}.`
    }
  }
}

function send(method: Method, path: string, token: string | null, body?: unknown) {
  let req = t.api()[method](`/api/v1${path}`)
  if (token) req = req.set(bearer(token))
  return body === undefined ? req : req.send(body as object)
}

beforeAll(async () => {
  t = await startTestApp({ signInLimit: 1000 })
  org = await t.createOrg('Roles Org')
  other = await t.createOrg('Stranger Org')
  const { models } = t.ctx
  world = {
    org,
    freshEmail: () => `person-${++emailCounter}@roles.example`,
    async freshTank(archived = false) {
      const tank = await tanksService(t.ctx).create(ownerActor(org), tankInputSchema.parse(sampleTank(org.siteIds[0])))
      if (archived) await models.Tank.update({ archivedAt: new Date() }, { where: { id: tank.id } })
      return tank.id
    },
    async freshSite(archived = false) {
      const site = await models.Site.create({
        organizationId: org.organizationId,
        name: 'Fresh site',
        timeZone: 'Europe/Berlin',
        archivedAt: archived ? new Date() : null,
      })
      return site.id
    },
    async freshInvitation() {
      const input = { email: world.freshEmail(), name: 'Invitee', role: 'keeper' as const }
      const { invitation, link } = await usersService(t.ctx).invite(ownerActor(org), input)
      return { id: invitation.id, token: new URL(link, 'http://localhost').searchParams.get('token')! }
    },
    async freshUser() {
      const user = await models.User.create({
        organizationId: org.organizationId,
        email: world.freshEmail(),
        name: 'Target',
        role: 'keeper',
        passwordHash: 'unused',
      })
      return user.id
    },
    async freshDevice() {
      const res = await send('post', '/devices', await freshToken(org.users.owner.id), await probe(world))
      expect(res.status, JSON.stringify(res.body)).toBe(201)
      return res.body.device.id as number
    },
    async freshSiteRule() {
      const rule = await models.WatchRule.create({ organizationId: org.organizationId, siteId: org.siteIds[0], tankId: null, ...storedRule })
      return rule.id
    },
    async freshTankRule() {
      const tankId = await world.freshTank()
      const rule = await models.WatchRule.create({ organizationId: org.organizationId, siteId: org.siteIds[0], tankId, ...storedRule })
      return rule.id
    },
    async freshSnooze() {
      const tankId = await world.freshTank()
      const s = snoozeBody()
      const snooze = await models.Snooze.create({
        organizationId: org.organizationId,
        tankId,
        reason: s.reason,
        startsAt: new Date(s.startsAt),
        endsAt: new Date(s.endsAt),
        createdBy: org.users.keeper.id,
      })
      return snooze.id
    },
    async freshMaintenanceWindow() {
      const row = await models.MaintenanceWindow.create({
        organizationId: org.organizationId,
        siteId: org.siteIds[0],
        tankId: null,
        ruleId: null,
        reason: 'Glass polish',
        startsAt: null,
        endsAt: null,
        weekday: 1,
        startMinute: 540,
        durationMinutes: 90,
        createdBy: org.users.owner.id,
      })
      return row.id
    },
    async freshIncident() {
      const tankId = await world.freshTank()
      const incident = await createIncidentRow(t.ctx, org, tankId)
      return incident.id
    },
    async freshAckToken() {
      const link = await ackLinksService(t.ctx).create(await world.freshIncident(), org.users.keeper.id)
      return new URL(link).searchParams.get('token')!
    },
    async freshShift(siteId) {
      const input = { userId: org.users.keeper.id, weekday: 2, start: '09:00', end: '13:00' }
      return (await rosterService(t.ctx).createShift(ownerActor(org), siteId, input)).id
    },
    async freshOverride(siteId) {
      const input = { userId: org.users.keeper.id, kind: 'remove' as const, startsAt: inHours(1), endsAt: inHours(3), note: '' }
      return (await rosterService(t.ctx).createOverride(ownerActor(org), siteId, input)).id
    },
    async freshWallKey() {
      const { credential, link } = await wallService(t.ctx).createCredential(ownerActor(org), org.siteIds[0], 'Roles wall')
      return { id: credential.id, key: new URL(link, 'http://localhost').searchParams.get('key')! }
    },
    async freshClient() {
      const client = await models.Client.create({ organizationId: org.organizationId, kind: 'company', name: 'Fresh client' })
      await models.Tank.update({ clientId: client.id }, { where: { id: await world.freshTank() } })
      return client.id
    },
    async freshVisit() {
      const clientId = await world.freshClient()
      const tank = await models.Tank.findOne({ where: { clientId } })
      const visit = await models.Visit.create({
        organizationId: org.organizationId,
        clientId,
        siteId: tank!.siteId,
        technicianId: org.users.keeper.id,
        startsAt: new Date(),
        endsAt: new Date(Date.now() + HOUR),
        tankIds: [tank!.id],
      })
      return visit.id
    },
    async freshMail() {
      const mail = await models.FakeMailboxMessage.create({
        organizationId: org.organizationId,
        envelopeFrom: 'alerts@tankwarden.invalid',
        envelopeTo: [org.users.owner.email],
        subject: 'Alarm: Temperature above 28 °C',
        textBody: 'Check the heater',
        htmlBody: null,
        headers: {},
        attachments: [],
        rawSize: 120,
      })
      return mail.id
    },
    async freshPushDevice() {
      const body = pushDeviceBody()
      const device = await models.PushSubscription.create({ userId: org.users.owner.id, endpoint: body.endpoint, ...body.keys, label: body.label })
      return device.id
    },
  }
})
beforeAll(async () => {
  const client = await t.ctx.models.Client.create({ organizationId: org.organizationId, kind: 'person', name: 'Own client' })
  await t.ctx.models.Tank.update({ clientId: client.id }, { where: { id: await world.freshTank() } })
  const person = await t.ctx.models.User.create({
    organizationId: org.organizationId,
    email: 'client-person@roles.example',
    name: 'Client person',
    role: 'viewer',
    clientId: client.id,
    passwordHash: (await t.ctx.models.User.findByPk(org.users.viewer.id))!.passwordHash,
  })
  clientViewerId = person.id
})
afterAll(async () => {
  console.log(`route-roles: ${CASES.length} cases (${ROUTES.length} routes × ${CALLERS.length} callers)`)
  await t?.close()
})

describe('every route × every caller answers the exact status', () => {
  it.each(CASES.map((c) => [`${c.name} → ${c.status}`, c] as const))('%s', async (_name, c) => {
    const { param, query, body } = await c.prepare(world)
    const values = Array.isArray(param) ? [...param] : [param]
    const path = `${c.route.replace(/:\w+/g, () => String(values.shift()))}${query ? `?${query}` : ''}`
    const res = await send(c.method, path, await tokenFor(c.caller), body)
    expect(res.status, JSON.stringify(res.body)).toBe(c.status)
    if (ERROR_CODES[c.status]) expect(res.body.error.code).toBe(ERROR_CODES[c.status])
  })
})

describe('the table itself', () => {
  it('lists exactly the routes the app serves', () => {
    type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; rawPath?: string }
    const walk = (stack: Layer[], prefix: string): string[] =>
      stack.flatMap((layer) => {
        if (layer.route) {
          const path = `${prefix}${layer.route.path}`.replace(/(.)\/$/, '$1')
          return Object.keys(layer.route.methods).map((m) => `${m.toUpperCase()} ${path}`)
        }
        if (layer.handle?.stack) return walk(layer.handle.stack, prefix + (layer.rawPath === '/' ? '' : (layer.rawPath ?? '')))
        return []
      })
    const served = walk((t.app as unknown as { router: { stack: Layer[] } }).router.stack, '')
      .map((r) => r.replace(' /api/v1', ' '))
      .sort()
    const listed = [
      ...ROUTES.map((r) => `${r.method.toUpperCase()} ${r.route}`),
      ...CHECKED_IN_CARE_ROLES,
      ...CHECKED_IN_PHOTO_ROLES,
      ...CHECKED_IN_REPORT_ROLES,
      ...CHECKED_IN_IMPORT_ROLES,
      ...CHECKED_IN_BUILD_ROLES,
    ].sort()
    const notInTable = served.filter((r) => !listed.includes(r))
    const notServed = listed.filter((r) => !served.includes(r))
    expect({ notInTable, notServed }).toEqual({ notInTable: [], notServed: [] })
    expect(listed).toEqual(served)
  })

  it("no wall key can write anything: it opens its own site's wall, and elsewhere gets what no token gets", async () => {
    const name = (r: RouteCase) => `${r.method.toUpperCase()} ${r.route}`
    expect(ROUTES.filter((r) => r.expected.wall !== r.expected.noToken).map(name)).toEqual(['GET /sites/:id/wall', 'GET /sites/:id/wall/trends'])
    expect(ROUTES.filter((r) => r.expected.wall !== 401).map(name)).toEqual([
      'GET /health',
      'POST /auth/sign-in',
      'POST /auth/password-reset',
      'POST /auth/password-reset/confirm',
      'GET /setup',
      'POST /setup',
      'GET /invitations/:token',
      'POST /invitations/accept',
      'GET /ack-links/:token',
      'POST /ack-links/use',
      'GET /sites/:id/wall',
      'GET /sites/:id/wall/trends',
    ])
    const { key } = await world.freshWallKey()
    for (const siteId of [org.siteIds[1], other.siteIds[0]]) {
      expect((await send('get', `/sites/${siteId}/wall`, key)).status).toBe(404)
      expect((await send('get', `/sites/${siteId}/wall/trends?tankIds=1`, key)).status).toBe(404)
    }
  })

  it('the forged tokens fail only on what was forged: the same claims signed properly are accepted', async () => {
    const { sub, jti, ...rest } = await ownerClaims()
    const good = jwt.sign(rest, JWT_SECRET, { algorithm: 'HS256', subject: sub, jwtid: jti, expiresIn: 60 })
    const res = await send('get', '/auth/me', good)
    expect(res.status).toBe(200)
    expect(res.body.user.id).toBe(org.users.owner.id)
  })
})
