import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { sampleTank } from './app'
import { fuzzRoute, reportLine, type FuzzRoute } from './fuzz-http'
import { buildFuzzWorld, inHours, type FuzzWorld } from './fuzz-world'

/** numRuns per route; FUZZ_RUNS changes it, FUZZ_SEED fixes the seed to replay a failure. */
const NUM_RUNS = Number(process.env.FUZZ_RUNS ?? 60)
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined
const ago = (minutes: number) => new Date(Date.now() - minutes * 60_000).toISOString()

const ruleBody = { name: 'pH below 6.5', severity: 'warning', spec: { kind: 'below', metric: 'ph', limit: 6.5, holdMinutes: 5 }, enabled: true }
const kitBody = () => ({
  takenAt: ago(10),
  values: [
    { metric: 'ph', value: 7.1, unit: 'pH' },
    { metric: 'temperature', value: 25, unit: 'C' },
  ],
  notes: 'weekly',
})

/** Sign-in, passwords, invitations, users, sites. */
export const accountsRoutes = (w: FuzzWorld): FuzzRoute[] => [
  { method: 'post', path: '/auth/sign-in', base: { email: w.org.users.keeper.email, password: w.password }, allowed: [200, 400, 401, 413] },
  // A wrong current password, so no case ever changes the owner's password under the other cases.
  {
    method: 'post',
    path: '/auth/password',
    token: w.owner,
    base: { currentPassword: 'not-the-password', newPassword: 'a-long-enough-password' },
    allowed: [204, 400, 401, 403, 413],
  },
  { method: 'post', path: '/auth/password-reset', base: { email: 'nobody@fuzz.example' }, allowed: [202, 400, 413] },
  { method: 'post', path: '/auth/password-reset/confirm', base: { token: 'x'.repeat(43), password: 'a-long-enough-password' } },
  { method: 'post', path: '/invitations/accept', base: { token: 'y'.repeat(43), password: 'a-long-enough-password', name: 'New keeper' } },
  { method: 'post', path: '/users/invitations', token: w.owner, base: { email: 'invitee@fuzz.example', name: 'Invitee', role: 'viewer', siteIds: [w.siteId] } },
  { method: 'patch', path: `/users/${w.targetUserId}`, token: w.owner, base: { role: 'keeper', active: true, name: 'Fuzz target', siteIds: [] } },
  { method: 'post', path: '/sites', token: w.owner, base: { name: 'Back room', timeZone: 'Europe/Paris', address: '1 Reed Lane', notes: '' } },
  {
    method: 'patch',
    path: `/sites/${w.org.siteIds[1]}`,
    token: w.owner,
    base: { name: 'Fish room', timeZone: 'America/New_York', address: '', notes: 'n', workdayEnd: '18:30' },
  },
  { method: 'patch', path: '/organization', token: w.owner, base: { clockStyle: '12h' } },
  { method: 'post', path: `/sites/${w.siteId}/wall-credentials`, token: w.owner, base: { name: 'Shop TV' } },
  // A notification device; the app alone runs here (no push sender), so no endpoint is ever called.
  {
    method: 'post',
    path: '/push/subscriptions',
    token: w.keeper,
    base: {
      endpoint: 'https://push.example/send/fuzz',
      keys: { p256dh: Buffer.alloc(65, 4).toString('base64url'), auth: Buffer.alloc(16, 7).toString('base64url') },
      label: 'Fuzz phone',
    },
  },
  { method: 'put', path: '/push/channels', token: w.keeper, base: { warning: 'mail', alarm: 'both' } },
]

/** Tanks, devices, HTTP readings, test-kit entries. */
export const tanksRoutes = (w: FuzzWorld): FuzzRoute[] => [
  {
    method: 'post',
    path: '/tanks',
    token: w.owner,
    knownFields: ['volumeLitres'],
    base: sampleTank(w.siteId, {
      name: 'Fuzzed tank',
      targets: { temperature: { min: 24, max: 28 } },
      notes: 'n',
      sortOrder: 3,
      substrateDepthCm: 5,
      filter: 'canister',
      media: 'sponge',
    }),
  },
  {
    method: 'patch',
    path: `/tanks/${w.tankId}`,
    token: w.owner,
    base: { name: 'Fuzz display tank', stage: 'established', heater: { watts: 200, setPointC: 26, topCm: 30 }, targets: { ph: { min: 6.5, max: 7.5 } } },
  },
  { method: 'post', path: '/devices', token: w.owner, base: { tankId: w.tankId, name: 'Probe', metrics: ['temperature'], intervalSeconds: 60 } },
  { method: 'patch', path: `/devices/${w.deviceId}`, token: w.owner, base: { name: 'Fuzz probe', metrics: ['temperature', 'ph'], intervalSeconds: 120 } },
  {
    method: 'post',
    path: `/devices/${w.deviceId}/calibrations`,
    token: w.owner,
    base: {
      metric: 'ph',
      points: [
        { buffer: 7, temperatureC: 25, reading: 7.05 },
        { buffer: 4.01, temperatureC: 25, reading: 4.1 },
      ],
      notes: '',
    },
  },
  {
    // Rejected readings are counted on the device by design: only `devices` may change on a 400.
    method: 'post',
    path: '/readings',
    token: w.sensor.token,
    mayTouch: ['devices'],
    allowed: [200, 400, 413],
    base: {
      v: 1,
      readings: [
        { metric: 'temperature', value: 25.5, unit: 'C', time: ago(1) },
        { metric: 'ph', value: 7, time: ago(1) },
      ],
    },
  },
  { method: 'post', path: `/tanks/${w.tankId}/test-kit-entries`, token: w.keeper, base: kitBody() },
  { method: 'put', path: `/test-kit-entries/${w.kitEntryId}`, token: w.keeper, base: kitBody() },
]

/** Rules, snoozes, maintenance windows, incidents, acknowledgement links. */
export const alertsRoutes = (w: FuzzWorld): FuzzRoute[] => [
  { method: 'post', path: `/tanks/${w.tankId}/rules`, token: w.owner, base: ruleBody },
  {
    method: 'post',
    path: `/sites/${w.siteId}/rules`,
    token: w.owner,
    base: { ...ruleBody, spec: { kind: 'outside', metric: 'temperature', min: 23, max: 29 } },
  },
  {
    method: 'put',
    path: `/tanks/${w.tankId}/rules/${w.siteRuleId}/override`,
    token: w.owner,
    base: { enabled: false, spec: { kind: 'below', metric: 'ph', limit: 6.2 } },
  },
  {
    method: 'patch',
    path: `/rules/${w.tankRuleId}`,
    token: w.owner,
    base: { name: 'Warm', severity: 'alarm', enabled: true, spec: { kind: 'above', metric: 'temperature', limit: 29 } },
  },
  {
    method: 'post',
    path: `/tanks/${w.tankId}/snoozes`,
    token: w.keeper,
    base: { reason: 'Water change', startsAt: inHours(1), endsAt: inHours(3), weekly: true, repeatUntil: inHours(24 * 30), includeHeaterLine: false },
  },
  {
    method: 'post',
    path: `/sites/${w.siteId}/maintenance-windows`,
    token: w.keeper,
    base: { reason: 'Weekly glass polish', tankId: w.tankId, repeat: 'weekly', weekday: 1, start: '09:00', durationMinutes: 90 },
  },
  { method: 'post', path: `/incidents/${w.ackIncidentId}/acknowledge`, token: w.keeper, base: { note: 'On it' } },
  { method: 'post', path: `/incidents/${w.resolveIncidentId}/resolve`, token: w.keeper, base: { note: 'Heater replaced' } },
  { method: 'post', path: '/ack-links/use', base: { token: w.ackToken, note: 'Seen' } },
]

/** The duty roster. */
export const rosterRoutes = (w: FuzzWorld): FuzzRoute[] => [
  {
    method: 'post',
    path: `/sites/${w.siteId}/roster/shifts`,
    token: w.owner,
    base: { userId: w.org.users.keeper.id, weekday: 0, start: '08:00', end: '16:00' },
  },
  {
    method: 'patch',
    path: `/sites/${w.siteId}/roster/shifts/${w.shiftId}`,
    token: w.owner,
    base: { userId: w.org.users.keeper.id, weekday: 1, start: '09:00', end: '17:00' },
  },
  {
    method: 'post',
    path: `/sites/${w.siteId}/roster/overrides`,
    token: w.owner,
    base: { userId: w.org.users.keeper.id, kind: 'add', startsAt: inHours(1), endsAt: inHours(5), note: 'cover' },
  },
  { method: 'put', path: `/sites/${w.siteId}/roster/backup`, token: w.owner, base: { userId: w.org.users.keeper.id } },
]

/** Care tasks, the care log, water changes and livestock. */
export const careRoutes = (w: FuzzWorld): FuzzRoute[] => [
  {
    method: 'post',
    path: `/tanks/${w.careTankId}/care-tasks`,
    token: w.owner,
    base: {
      kind: 'water_change',
      title: 'Weekly change',
      recurrence: { kind: 'weekdays', weekdays: [0, 3] },
      defaultValues: { percent: 25, note: 'siphon', gravel: true },
      startsOn: '2026-12-07',
      active: true,
    },
  },
  {
    method: 'patch',
    path: `/care-tasks/${w.careTaskId}`,
    token: w.owner,
    base: { title: 'Glass', recurrence: { kind: 'interval', everyDays: 5 }, defaultValues: {}, active: true },
  },
  { method: 'post', path: '/care-tasks/done', token: w.keeper, base: { tasks: [{ id: w.careTaskId, seenLastDoneAt: null }], notes: 'done' } },
  { method: 'post', path: `/care-tasks/${w.careTaskId}/done`, token: w.keeper, base: { notes: 'done', values: { sponge: true, minutes: 10 }, at: ago(10) } },
  { method: 'post', path: `/care-tasks/${w.careTaskId}/snooze`, token: w.keeper, base: { until: inHours(24), reason: 'Away at a show' } },
  {
    method: 'post',
    path: `/tanks/${w.careTankId}/care-log`,
    token: w.keeper,
    base: { kind: 'dosing', at: ago(5), text: 'Fertiliser 5 mL', values: { ml: 5 } },
  },
  {
    method: 'post',
    path: `/tanks/${w.careTankId}/water-changes/plan`,
    token: w.keeper,
    knownFields: ['percent'],
    base: { percent: 25, labelRate: { amount: 5, unit: 'mL', per: '10L' }, newWaterTempC: 25 },
  },
  {
    method: 'post',
    path: `/tanks/${w.tankId}/water-changes`,
    token: w.keeper,
    knownFields: ['percent'],
    base: { litres: 40, heaterOffConfirmed: true, newWaterTempC: 25 },
  },
  {
    method: 'post',
    path: `/water-changes/${w.waterChangeId}/finish`,
    token: w.keeper,
    base: { litresReplaced: 40, dechlorinatorMl: 8, newWaterTempC: 25, notes: 'clear' },
  },
  {
    method: 'post',
    path: `/tanks/${w.careTankId}/livestock`,
    token: w.keeper,
    knownFields: ['speciesKey'],
    base: {
      name: 'Cherry shrimp',
      category: 'invertebrate',
      count: 10,
      addedAt: ago(30),
      source: 'Local breeder',
      notes: '',
      acclimation: { bagLitres: 1, bagTempC: 24, bagPh: 7.2, intervalMinutes: 5 },
    },
  },
  { method: 'patch', path: `/tanks/${w.careTankId}/livestock/${w.livestockId}`, token: w.keeper, base: { count: 11, losses: 1, removedAt: null, notes: '' } },
]

/**
 * One suite: hostile JSON bodies around a valid one on each route must get a documented status, a
 * clear error naming the field, and leave every table as it was when refused. Prints a line per
 * route and a total (cases tried, failures).
 */
export function fuzzSuite(name: string, routesOf: (w: FuzzWorld) => FuzzRoute[]) {
  let w: FuzzWorld
  const unexpected: unknown[] = []
  const onUnexpected = (error: unknown) => unexpected.push(error)
  beforeAll(async () => {
    process.on('unhandledRejection', onUnexpected)
    process.on('uncaughtException', onUnexpected)
    w = await buildFuzzWorld()
  })
  afterAll(async () => {
    process.off('unhandledRejection', onUnexpected)
    process.off('uncaughtException', onUnexpected)
    await w?.t.close()
  })
  describe(`hostile JSON bodies: ${name}`, () => {
    it('answers each with a documented status and a clear error, and writes nothing when it refuses', { timeout: 600_000 }, async () => {
      const failures: string[] = []
      let cases = 0
      const routes = routesOf(w)
      for (const route of routes) {
        const outcome = await fuzzRoute(w.t.app, w.t.ctx.sequelize, route, { numRuns: NUM_RUNS, seed: SEED, settle: () => w.t.ctx.readings.status.flush() })
        console.log(reportLine(outcome))
        cases += outcome.cases
        failures.push(...outcome.failures)
      }
      console.log(`fuzz ${name}: ${routes.length} routes, ${cases} cases, ${failures.length} failures, ${unexpected.length} unhandled errors`)
      expect(failures.slice(0, 10)).toEqual([])
      expect(unexpected).toEqual([])
      // The process is still serving after all of it.
      expect((await w.t.api().get('/api/v1/health')).status).toBe(200)
    })
  })
}
