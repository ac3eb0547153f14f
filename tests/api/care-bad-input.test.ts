import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { UserActor } from '../../server/access/actor'
import { createDefaultCareTasks } from '../../server/care/care-tasks'
import { waterChangesService } from '../../server/care/water-changes'
import type { TestOrg } from '../helpers/app'
import { as, newTank, startCareTestApp, type CareTestApp } from './care-helpers'

// Every care and chemistry route, fed zero, negative, too-large and wrong-typed values: each
// answer is a 400 naming the field, and nothing is written.
let t: CareTestApp
let org: TestOrg
let tankId: number
let taskId: number
let changeId: number
let entryPath: string

beforeAll(async () => {
  t = await startCareTestApp()
  org = await t.createOrg('Bad Input Org')
  tankId = await newTank(t, org)
  const tank = (await t.ctx.models.Tank.findByPk(tankId))!
  taskId = (await createDefaultCareTasks(t.ctx, tank))[0]!.id
  const actor: UserActor = {
    kind: 'user',
    userId: org.users.keeper.id,
    organizationId: org.organizationId,
    role: 'keeper',
    siteIds: null,
    sessionId: 'bad-input',
  }
  changeId = (await waterChangesService(t.ctx).start(actor, await newTank(t, org), { percent: 10, heaterOffConfirmed: false })).id
  const entry = await t.ctx.models.LivestockEntry.create({
    organizationId: org.organizationId,
    tankId,
    speciesKey: null,
    name: 'Probe fish',
    category: 'fish',
    count: 3,
    addedAt: new Date(),
  })
  entryPath = `/tanks/${tankId}/livestock/${entry.id}`
})
afterAll(() => t.close())

type Case = [method: 'get' | 'post' | 'patch', path: () => string, body: unknown, field: string]
const future = () => new Date(Date.now() + 3_600_000).toISOString()
const cases: Case[] = [
  // Care tasks
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 0 } }, 'recurrence.everyDays'],
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 366 } }, 'recurrence.everyDays'],
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'weekdays', weekdays: [7] } }, 'recurrence.weekdays.0'],
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'weekdays', weekdays: [] } }, 'recurrence.weekdays'],
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'polish_rocks', recurrence: { kind: 'interval', everyDays: 7 } }, 'kind'],
  ['post', () => `/tanks/${tankId}/care-tasks`, { kind: 'glass_clean', recurrence: { kind: 'interval', everyDays: 7 }, startsOn: '2026-02-30' }, 'startsOn'],
  ['patch', () => `/care-tasks/${taskId}`, { title: '' }, 'title'],
  ['patch', () => `/care-tasks/${taskId}`, { recurrence: { kind: 'interval', everyDays: -1 } }, 'recurrence.everyDays'],
  ['post', () => `/care-tasks/${taskId}/done`, { at: future() }, 'at'],
  ['post', () => `/care-tasks/${taskId}/done`, { at: 'yesterday' }, 'at'],
  ['post', () => `/care-tasks/${taskId}/done`, { notes: 'x'.repeat(2001) }, 'notes'],
  ['post', () => `/care-tasks/${taskId}/snooze`, { until: new Date(Date.now() - 60_000).toISOString(), reason: 'Late' }, 'until'],
  ['post', () => `/care-tasks/${taskId}/snooze`, { until: new Date(Date.now() + 61 * 86_400_000).toISOString(), reason: 'Long' }, 'until'],
  ['post', () => `/care-tasks/${taskId}/snooze`, { until: future(), reason: '' }, 'reason'],
  ['get', () => '/care/today?siteId=0', undefined, 'siteId'],
  ['get', () => `/care/today?siteId=${org.siteIds[0]}&mine=true`, undefined, 'siteId'],
  // Care log
  ['post', () => `/tanks/${tankId}/care-log`, { kind: 'task_done', text: 'By hand' }, 'kind'],
  ['post', () => `/tanks/${tankId}/care-log`, { kind: 'note' }, 'text'],
  ['post', () => `/tanks/${tankId}/care-log`, { kind: 'note', text: 'Later', at: future() }, 'at'],
  ['get', () => `/tanks/${tankId}/care-log?from=last-week`, undefined, 'from'],
  // Water changes
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: -1 }, 'percent'],
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: '20' }, 'percent'],
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: 20, labelRate: { amount: 0, unit: 'mL', per: '10L' } }, 'labelRate.amount'],
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: 20, labelRate: { amount: 5, unit: 'cups', per: '10L' } }, 'labelRate.unit'],
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: 20, newWaterTempC: 41 }, 'newWaterTempC'],
  ['post', () => `/tanks/${tankId}/water-changes/plan`, { percent: 20, newWaterTempC: -3 }, 'newWaterTempC'],
  ['post', () => `/tanks/${tankId}/water-changes`, { litres: 0 }, 'litres'],
  ['post', () => `/tanks/${tankId}/water-changes`, { percent: 20, heaterOffConfirmed: 'yes' }, 'heaterOffConfirmed'],
  ['post', () => `/water-changes/${changeId}/finish`, { litresReplaced: 0 }, 'litresReplaced'],
  ['post', () => `/water-changes/${changeId}/finish`, { litresReplaced: 10_000 }, 'litresReplaced'],
  ['post', () => `/water-changes/${changeId}/finish`, { litresReplaced: 10, dechlorinatorMl: -1 }, 'dechlorinatorMl'],
  ['post', () => `/water-changes/${changeId}/finish`, { litresReplaced: 10, newWaterTempC: 45 }, 'newWaterTempC'],
  ['post', () => `/water-changes/${changeId}/cancel`, { reason: 'x'.repeat(301) }, 'reason'],
  ['post', () => '/water-changes/abc/cancel', {}, 'id'],
  // Livestock and acclimation
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 0 }, 'count'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 2.5 }, 'count'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'no_such_fish', count: 2 }, 'speciesKey'],
  ['post', () => `/tanks/${tankId}/livestock`, { count: 2 }, 'speciesKey'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 2, addedAt: future() }, 'addedAt'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 2, acclimation: { bagLitres: 0 } }, 'acclimation.bagLitres'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 2, acclimation: { bagLitres: 1, bagTempC: 50 } }, 'acclimation.bagTempC'],
  ['post', () => `/tanks/${tankId}/livestock`, { speciesKey: 'zebra_danio', count: 2, acclimation: { bagLitres: 1, bagPh: 2 } }, 'acclimation.bagPh'],
  [
    'post',
    () => `/tanks/${tankId}/livestock`,
    { speciesKey: 'zebra_danio', count: 2, acclimation: { bagLitres: 1, intervalMinutes: 2 } },
    'acclimation.intervalMinutes',
  ],
  ['patch', () => entryPath, { losses: -1 }, 'losses'],
  ['patch', () => entryPath, { count: -2 }, 'count'],
  ['patch', () => entryPath, { removedAt: 'soon' }, 'removedAt'],
]

describe('out-of-range input to the care routes', () => {
  // The paths need the ids made in beforeAll, so the titles name the route by its shape.
  it.each(
    cases.map(([method, path, body, field]) => ({
      method,
      path,
      body,
      field,
      label: `${method.toUpperCase()} ${String(path)
        .replace(/^\(\) => /, '')
        .replace(/\$\{[^}]+\}/g, ':id')}`,
    })),
  )('$label → 400 naming $field', async ({ method, path, body, field }) => {
    const before = await Promise.all([
      t.ctx.models.CareLogEntry.count(),
      t.ctx.models.LivestockEntry.count(),
      t.ctx.models.CareTask.count(),
      t.ctx.models.WaterChange.count(),
    ])
    let req = t.api()[method](`/api/v1${path()}`).set(as(org, 'owner'))
    if (body !== undefined) req = req.send(body as object)
    const res = await req
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(res.body.error.code).toBe('invalid_input')
    expect(Object.keys(res.body.error.fields ?? {})).toContain(field)
    expect(res.body.error.message).toContain(field)
    const after = await Promise.all([
      t.ctx.models.CareLogEntry.count(),
      t.ctx.models.LivestockEntry.count(),
      t.ctx.models.CareTask.count(),
      t.ctx.models.WaterChange.count(),
    ])
    expect(after).toEqual(before)
  })
})
