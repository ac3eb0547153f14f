import { QueryTypes } from 'sequelize'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { BACKUP_TABLES, mapIds } from '../../server/exports/backup-tables'
import { bearer, startTestApp, TEST_PASSWORD } from '../helpers/app'
import { insertReading, insertRow, signedInUser, tankValues } from './export-helpers'

let t: Awaited<ReturnType<typeof startTestApp>>
const stamp = `${process.pid}-${Date.now()}`
const ownerEmail = `wren@marrowfen-${stamp}.example`

type Backup = { tables: Record<string, Array<Record<string, unknown>>>; readings: unknown[][]; [key: string]: unknown }

/** An organization with a row in every table a backup holds, the references between them included. */
async function buildOrganization() {
  const org = await t.ctx.models.Organization.create({ name: 'Marrowfen Aquatics' })
  const o = org.id
  const owner = await signedInUser(t.ctx, o, 'owner', ownerEmail)
  const keeper = await insertRow(t.ctx, 'users', {
    organization_id: o,
    email: `ash@marrowfen-${stamp}.example`,
    name: 'Ash Keeper',
    role: 'keeper',
    password_hash: 'x',
    unit_preferences: JSON.stringify({ temperature: 'F' }),
  })
  const client = await insertRow(t.ctx, 'clients', {
    organization_id: o,
    kind: 'company',
    name: 'Harbour Café',
    email: 'tanks@harbour.example',
    address: '1 Quay',
  })
  const viewer = await insertRow(t.ctx, 'users', {
    organization_id: o,
    email: `client@marrowfen-${stamp}.example`,
    name: 'Tank client',
    role: 'viewer',
    password_hash: 'x',
  })
  await insertRow(t.ctx, 'users', {
    organization_id: o,
    email: `cafe@marrowfen-${stamp}.example`,
    name: 'Café manager',
    role: 'viewer',
    password_hash: 'x',
    client_id: client,
  })
  const site = await insertRow(t.ctx, 'sites', {
    organization_id: o,
    name: 'Riverside shop',
    time_zone: 'Europe/London',
    backup_user_id: keeper,
    workday_end: '17:30',
  })
  const room = await insertRow(t.ctx, 'sites', {
    organization_id: o,
    name: 'Fish room',
    time_zone: 'Europe/Berlin',
    archived_at: '2026-06-01T10:00:00.123456Z',
  })
  await insertRow(t.ctx, 'user_sites', { user_id: viewer, site_id: site })
  const tank = await insertRow(t.ctx, 'tanks', { ...tankValues(o, site, 'Display 1'), heater: JSON.stringify({ watts: 150, setPointC: 25, topCm: 30 }) })
  const tank2 = await insertRow(t.ctx, 'tanks', tankValues(o, room, 'Quarantine'))
  await insertRow(t.ctx, 'tanks', { ...tankValues(o, site, 'Café tank'), client_id: client })
  const device = await insertRow(t.ctx, 'devices', {
    organization_id: o,
    tank_id: tank,
    name: 'Display probe',
    metrics: ['temperature', 'ph'],
    interval_seconds: 60,
    token_hash: 'secret-hash',
  })
  await insertRow(t.ctx, 'calibrations', {
    organization_id: o,
    device_id: device,
    metric: 'ph',
    method: 'ph_buffers',
    points: JSON.stringify([
      { buffer: 7, temperatureC: 25, reading: 7.1 },
      { buffer: 4.01, temperatureC: 25, reading: 4.2 },
    ]),
    gain: 1.031,
    intercept: -0.32,
    slope_percent: 97,
    offset_mv: -5.9,
    slope_ok: true,
    performed_at: '2026-06-02T09:00:00Z',
    performed_by: owner.id,
  })
  const siteRule = await insertRow(t.ctx, 'watch_rules', {
    organization_id: o,
    site_id: site,
    name: 'Warm',
    severity: 'alarm',
    spec: JSON.stringify({ kind: 'above', metric: 'temperature', limit: 28 }),
    created_by: owner.id,
  })
  const override = await insertRow(t.ctx, 'watch_rules', {
    organization_id: o,
    site_id: site,
    tank_id: tank,
    overrides_rule_id: siteRule,
    name: 'Warm (display)',
    severity: 'warning',
    spec: JSON.stringify({ kind: 'above', metric: 'temperature', limit: 29 }),
  })
  const siteIncident = await insertRow(t.ctx, 'site_incidents', {
    organization_id: o,
    site_id: site,
    cause: 'heat',
    severity: 'warning',
    title: 'Warm across the shop',
    state: 'acknowledged',
    opened_at: '2026-07-01T12:05:00Z',
    acknowledged_at: '2026-07-01T12:10:00Z',
    acknowledged_by: keeper,
  })
  const incident = await insertRow(t.ctx, 'incidents', {
    organization_id: o,
    site_id: site,
    tank_id: tank,
    rule_id: override,
    rule_kind: 'above',
    metric: 'temperature',
    severity: 'warning',
    title: 'Warm',
    state: 'acknowledged',
    condition_since: '2026-07-01T12:00:00Z',
    opened_at: '2026-07-01T12:05:00Z',
    first_value: 29.2,
    acknowledged_at: '2026-07-01T12:10:00Z',
    acknowledged_by: keeper,
    flap_count: 2,
    last_flap_at: '2026-07-01T12:30:00Z',
    cause: 'heat',
    site_incident_id: siteIncident,
  })
  await insertRow(t.ctx, 'maintenance_windows', {
    organization_id: o,
    site_id: site,
    tank_id: tank,
    reason: 'Tuesday glass day',
    weekday: 1,
    start_minute: 540,
    duration_minutes: 90,
    created_by: keeper,
  })
  await insertRow(t.ctx, 'incident_events', {
    incident_id: incident,
    kind: 'acknowledged',
    user_id: keeper,
    at: '2026-07-01T12:10:00Z',
    detail: JSON.stringify({ note: 'fan on' }),
  })
  await insertRow(t.ctx, 'snoozes', {
    organization_id: o,
    tank_id: tank,
    reason: 'Water change',
    starts_at: '2026-07-02T09:00:00Z',
    ends_at: '2026-07-02T10:00:00Z',
    created_by: keeper,
  })
  await insertRow(t.ctx, 'duty_shifts', { organization_id: o, site_id: site, user_id: keeper, weekday: 0, start_time: '08:00', end_time: '16:00' })
  await insertRow(t.ctx, 'duty_overrides', {
    organization_id: o,
    site_id: site,
    user_id: owner.id,
    kind: 'add',
    starts_at: '2026-07-03T08:00:00Z',
    ends_at: '2026-07-03T16:00:00Z',
    note: 'covering',
  })
  const salt = await insertRow(t.ctx, 'consumables', {
    organization_id: o,
    site_id: site,
    kind: 'salt',
    name: 'Reef salt',
    unit: 'kg',
    quantity: 12.5,
    low_at: 2,
    expires_on: '2027-03-01',
  })
  const course = await insertRow(t.ctx, 'treatment_courses', {
    organization_id: o,
    tank_id: tank,
    product: 'Copper treatment',
    dose: JSON.stringify({ amount: 1, unit: 'mL', perLitres: 10 }),
    days: 14,
    starts_on: '2026-07-01',
    ends_on: '2026-07-14',
    tests: JSON.stringify([{ metric: 'copper', timesPerDay: 2, band: null }]),
    created_by: keeper,
  })
  await insertRow(t.ctx, 'care_tasks', {
    organization_id: o,
    tank_id: tank,
    kind: 'treatment_dose',
    title: 'Dose copper treatment',
    recurrence: JSON.stringify({ kind: 'interval', everyDays: 1 }),
    starts_on: '2026-07-01',
    ends_on: '2026-07-14',
    treatment_course_id: course,
  })
  const task = await insertRow(t.ctx, 'care_tasks', {
    organization_id: o,
    tank_id: tank,
    kind: 'water_change',
    title: 'Weekly change',
    recurrence: JSON.stringify({ kind: 'interval', everyDays: 7 }),
    starts_on: '2026-07-01',
    last_done_by: keeper,
    consumable_id: salt,
    consumable_amount: 1.5,
  })
  await insertRow(t.ctx, 'equipment', {
    organization_id: o,
    tank_id: tank,
    kind: 'lamp',
    name: 'Display lamp',
    model: 'T5 tube',
    watts: 39,
    installed_on: '2026-01-10',
    service_action: 'replace',
    service_every_days: 365,
    care_task_id: task,
  })
  const build = await insertRow(t.ctx, 'tank_builds', {
    organization_id: o,
    tank_id: tank,
    plan: JSON.stringify({ fillHeightCm: 34, substrate: [] }),
    filled_on: '2026-06-20',
    created_by: keeper,
  })
  await insertRow(t.ctx, 'build_steps', {
    build_id: build,
    tank_id: tank,
    key: 'conditioner',
    title: 'Conditioner',
    day: 1,
    due_on: '2026-06-20',
    care_task_id: task,
    done_at: '2026-06-20T09:00:00Z',
    done_by: keeper,
  })
  const change = await insertRow(t.ctx, 'water_changes', {
    organization_id: o,
    tank_id: tank,
    status: 'finished',
    plan: JSON.stringify({ percent: 25 }),
    heater_off_confirmed: true,
    temporary_rule_id: siteRule,
    started_at: '2026-07-02T09:00:00Z',
    finished_at: '2026-07-02T09:40:00Z',
    litres_replaced: 30,
  })
  const log = await insertRow(t.ctx, 'care_log', {
    organization_id: o,
    tank_id: tank,
    kind: 'water_change',
    at: '2026-07-02T09:40:00Z',
    user_id: keeper,
    text: '25 %',
    values: JSON.stringify({ litres: 30 }),
    care_task_id: task,
    water_change_id: change,
  })
  await t.ctx.sequelize.query('UPDATE water_changes SET care_log_entry_id = $1 WHERE id = $2', { bind: [log, change] })
  const batch = await insertRow(t.ctx, 'livestock', {
    organization_id: o,
    tank_id: tank2,
    species_key: 'zebra_danio',
    name: 'Zebra danio',
    category: 'fish',
    count: 8,
    added_at: '2026-06-20T10:00:00Z',
    created_by: keeper,
  })
  const split = await insertRow(t.ctx, 'livestock', {
    organization_id: o,
    tank_id: tank,
    species_key: 'zebra_danio',
    name: 'Zebra danio',
    category: 'fish',
    count: 3,
    added_at: '2026-06-20T10:00:00Z',
    parent_id: batch,
  })
  await t.ctx.sequelize.query('UPDATE livestock SET moved_out = 3 WHERE id = $1', { bind: [batch] })
  await insertRow(t.ctx, 'livestock_events', {
    organization_id: o,
    livestock_id: batch,
    kind: 'moved',
    at: '2026-06-25T10:00:00Z',
    count: 3,
    from_tank_id: tank2,
    to_tank_id: tank,
    split_id: split,
    user_id: keeper,
  })
  const entry = await insertRow(t.ctx, 'test_kit_entries', {
    organization_id: o,
    tank_id: tank,
    entered_by: keeper,
    taken_at: '2026-07-01T08:00:00Z',
    values: JSON.stringify([{ metric: 'ph', value: 7.1 }]),
  })
  await insertRow(t.ctx, 'test_kit_entry_revisions', {
    entry_id: entry,
    action: 'edit',
    changed_by: keeper,
    snapshot: JSON.stringify({ values: [{ metric: 'ph', value: 7.2 }] }),
  })
  // A closed visit: its tank list and the ids inside its work (tank, ticked task, test-kit entry) come back remapped.
  await insertRow(t.ctx, 'visits', {
    organization_id: o,
    client_id: client,
    site_id: site,
    technician_id: keeper,
    starts_at: '2026-07-02T09:00:00Z',
    ends_at: '2026-07-02T10:00:00Z',
    tank_ids: [tank],
    state: 'closed',
    arrived_at: '2026-07-02T09:05:00Z',
    left_at: '2026-07-02T09:50:00Z',
    notes: 'Glass cleaned',
    materials: JSON.stringify([{ what: 'Filter floss', amount: 1, unit: 'pack' }]),
    work: JSON.stringify([
      { tankId: tank, tankName: 'Display 1', doneTasks: [{ id: task, title: 'Weekly change' }], kitEntryId: entry, readings: [], notes: 'Fine', next: [] },
    ]),
    closed_at: '2026-07-02T09:50:00Z',
    closed_by: keeper,
  })
  // An hour whose raw rows retention has deleted: raw rows are kept from 1 July on.
  await t.ctx.sequelize.query("UPDATE readings_rollup_state SET raw_kept_from = '2026-07-01T00:00:00Z'")
  await insertRow(t.ctx, 'readings_hourly', { tank_id: tank, metric: 'temperature', hour: '2026-06-30T12:00:00Z', min: 25, max: 29.2, sum: 1620.4, count: 60 })
  await insertReading(t.ctx, { tankId: tank, metric: 'temperature', time: '2026-07-01T12:00:00.123Z', value: 25.1, source: 'device', sourceKey: `d:${device}` })
  await insertReading(t.ctx, { tankId: tank, metric: 'ph', time: '2026-07-01T08:00:00Z', value: 7.1, source: 'test_kit', sourceKey: `k:${entry}` })
  await insertReading(t.ctx, { tankId: tank2, metric: 'temperature', time: '2026-07-01T08:00:00Z', value: 0.1 + 0.2, source: 'import', sourceKey: 'i:7' })
  return { organizationId: o, owner }
}

/** A fresh organization with only its owner, as a restore needs. */
async function emptyOrganization(email: string) {
  const org = await t.ctx.models.Organization.create({ name: 'New organization' })
  return { organizationId: org.id, owner: await signedInUser(t.ctx, org.id, 'owner', email) }
}

const download = async (token: string) => {
  const res = await t.api().get('/api/v1/backup').set(bearer(token))
  expect(res.status).toBe(200)
  return { res, backup: res.body as Backup }
}
const restore = (token: string, file: Buffer | string) =>
  t.api().post('/api/v1/backup/restore').set(bearer(token)).attach('file', Buffer.from(file), { filename: 'backup.json', contentType: 'application/json' })

/** Ids are the restoring database's own: replace each by its row's place in its table, then compare. */
function withoutIds(backup: Backup) {
  const rank = new Map<string, Map<unknown, number>>()
  for (const spec of BACKUP_TABLES) {
    if (spec.hasId) rank.set(spec.table, new Map(backup.tables[spec.table]!.map((row, i) => [row.id, i])))
  }
  const tables = Object.fromEntries(
    BACKUP_TABLES.map((spec) => [
      spec.table,
      backup.tables[spec.table]!.map((row) =>
        Object.fromEntries(
          Object.entries(row).map(([column, value]) => {
            if (column === 'id') return [column, rank.get(spec.table)!.get(value)]
            return [column, mapIds(spec, column, value, (table, id) => `${table}#${rank.get(table)!.get(id)}`)]
          }),
        ),
      ),
    ]),
  )
  const sourceKey = (key: string) =>
    key
      .replace(/^d:(\d+)$/, (_, id) => `device#${rank.get('devices')!.get(Number(id))}`)
      .replace(/^k:(\d+)$/, (_, id) => `entry#${rank.get('test_kit_entries')!.get(Number(id))}`)
  const readings = backup.readings.map(([tank, metric, time, value, source, key]) => [
    rank.get('tanks')!.get(tank),
    metric,
    time,
    value,
    source,
    sourceKey(key as string),
  ])
  return { ...backup, exportedAt: 'ignored', tables, readings }
}

beforeAll(async () => {
  t = await startTestApp()
})
afterAll(() => t.close())

describe('organization backup', () => {
  it('round-trips: export, restore into a new empty organization, export again: the same', async () => {
    const source = await buildOrganization()
    const first = await download(source.owner.token)
    expect(first.res.headers['content-disposition']).toMatch(/^attachment; filename="tankwarden-backup-marrowfen-aquatics-\d{4}-\d{2}-\d{2}\.json"$/)
    const file = first.res.text
    const backup = first.backup
    expect(backup.formatVersion).toBe(3)
    expect(backup.tables.users!.map((u) => u.email).sort()).toEqual([
      `ash@marrowfen-${stamp}.example`,
      `cafe@marrowfen-${stamp}.example`,
      `client@marrowfen-${stamp}.example`,
      ownerEmail,
    ])
    expect(file).not.toContain('password_hash')
    expect(file).not.toContain('secret-hash')
    expect(backup.tables.sites![1]!.archived_at).toBe('2026-06-01T10:00:00.123456+00:00')
    expect(backup.readings).toHaveLength(3)
    for (const spec of BACKUP_TABLES) expect(backup.tables[spec.table]!.length, spec.table).toBeGreaterThan(0)
    expect(backup.tables.visits![0]).not.toHaveProperty('photo_ids')

    // A visit naming a tank, or with work naming a test-kit entry, that the file lacks: 400 naming it, before anything is written.
    const spoilt = await emptyOrganization(`spoilt-${stamp}@marrowfen.example`)
    const visitSpoils: Array<[(visit: Record<string, unknown>) => void, string]> = [
      [(visit) => void (visit.tank_ids = [999999]), 'tables.visits.0.tank_ids'],
      [(visit) => void ((visit.work as Array<{ kitEntryId: number }>)[0]!.kitEntryId = 999999), 'tables.visits.0.work'],
      [(visit) => void (visit.work = [{ tankId: 'Display 1' }]), 'tables.visits.0.work.0.tankId'],
    ]
    for (const [spoil, field] of visitSpoils) {
      const spoiled = structuredClone(backup)
      spoil(spoiled.tables.visits![0]!)
      const refused = await restore(spoilt.owner.token, JSON.stringify(spoiled))
      expect(refused.status, field).toBe(400)
      expect(Object.keys(refused.body.error.fields), field).toContain(field)
    }

    // The organization is gone (the reason for a restore); its owner starts a new, empty one.
    await t.ctx.models.Organization.destroy({ where: { id: source.organizationId } })
    const target = await emptyOrganization(ownerEmail)
    const restored = await restore(target.owner.token, file)
    expect(restored.status, JSON.stringify(restored.body)).toBe(201)
    expect(restored.body.rows.users).toBe(3)
    expect(restored.body.rows.clients).toBe(1)
    expect(restored.body.rows.visits).toBe(1)
    expect(restored.body.readings).toBe(3)
    expect(restored.body.notes.join(' ')).toMatch(/new token.*new password/s)

    const second = await download(target.owner.token)
    expect(withoutIds(second.backup)).toEqual(withoutIds(backup))
    expect(second.backup.tables.sites![0]!.id).not.toBe(backup.tables.sites![0]!.id)
  })

  it('restores people without a usable password and devices without a usable token', async () => {
    const keeper = await t.ctx.models.User.findOne({ where: { email: `ash@marrowfen-${stamp}.example` } })
    expect(keeper).not.toBeNull()
    const signIn = await t.api().post('/api/v1/auth/sign-in').send({ email: keeper!.email, password: TEST_PASSWORD })
    expect(signIn.status).toBe(401)
    const [device] = (await t.ctx.sequelize.query("SELECT token_hash FROM devices WHERE name = 'Display probe'", { type: QueryTypes.SELECT })) as Array<{
      token_hash: string
    }>
    expect(device!.token_hash).toMatch(/^[0-9a-f]{64}$/)
    expect(device!.token_hash).not.toBe('secret-hash')
  })

  it('refuses to restore into an organization that has sites or other people (409), writing nothing', async () => {
    const source = await emptyOrganization(`solo-${stamp}@marrowfen.example`)
    await insertRow(t.ctx, 'sites', { organization_id: source.organizationId, name: 'Only site', time_zone: 'UTC' })
    const { res } = await download(source.owner.token)
    const busy = await t.createOrg('Busy Fishhouse')
    const before = await t.ctx.models.Site.count({ where: { organizationId: busy.organizationId } })
    const refused = await restore(busy.users.owner.token, res.text)
    expect(refused.status).toBe(409)
    expect(refused.body.error.code).toBe('organization_not_empty')
    expect(await t.ctx.models.Site.count({ where: { organizationId: busy.organizationId } })).toBe(before)
  })

  it('refuses people whose e-mail has an account elsewhere (409)', async () => {
    const source = await t.createOrg('Source Fishhouse')
    const { res } = await download(source.users.owner.token)
    const target = await emptyOrganization(`other-${stamp}@marrowfen.example`)
    const refused = await restore(target.owner.token, res.text)
    expect(refused.status).toBe(409)
    expect(refused.body.error.code).toBe('emails_taken')
    expect(Object.keys(refused.body.error.fields)).toContain(`users.${source.users.keeper.email.toLowerCase()}`)
  })

  it('is for owners only', async () => {
    const org = await t.createOrg('Roles Fishhouse')
    for (const role of ['keeper', 'viewer'] as const) {
      expect((await t.api().get('/api/v1/backup').set(bearer(org.users[role].token))).status).toBe(403)
      expect((await restore(org.users[role].token, '{}')).status).toBe(403)
    }
    expect((await t.api().get('/api/v1/backup')).status).toBe(401)
  })
})

describe('a malformed backup', () => {
  let file: Backup
  beforeAll(async () => {
    const source = await emptyOrganization(`shape-${stamp}@marrowfen.example`)
    const site = await insertRow(t.ctx, 'sites', { organization_id: source.organizationId, name: 'Shape site', time_zone: 'UTC' })
    const tank = await insertRow(t.ctx, 'tanks', tankValues(source.organizationId, site, 'Shape tank'))
    await insertReading(t.ctx, { tankId: tank, metric: 'ph', time: '2026-07-01T08:00:00Z', value: 7, source: 'import', sourceKey: 'i:1' })
    file = (await download(source.owner.token)).backup
    // Its one person still has an account here; without them each case reaches the part it spoils.
    file.tables.users = []
  })

  const cases: Array<[string, (b: Backup) => unknown, string]> = [
    ['a wrong format version', (b) => ({ ...b, formatVersion: 1 }), 'formatVersion'],
    [
      'a text where a number belongs',
      (b) => {
        b.tables.tanks![0]!.volume_litres = 'large'
        return b
      },
      'tables.tanks.0.volume_litres',
    ],
    [
      'an unknown column',
      (b) => {
        b.tables.sites![0]!.password_hash = 'x'
        return b
      },
      'tables.sites.0',
    ],
    [
      'a reference to a row that is not there',
      (b) => {
        b.tables.tanks![0]!.site_id = 999999
        return b
      },
      'tables.tanks.0.site_id',
    ],
    [
      'a reading of an unknown tank',
      (b) => {
        b.readings[0]![0] = 999999
        return b
      },
      'readings.0.0',
    ],
    [
      'a value the database refuses (negative volume)',
      (b) => {
        b.tables.tanks![0]!.volume_litres = -5
        return b
      },
      'tables.tanks',
    ],
    [
      'a reading twice',
      (b) => {
        b.readings.push([...b.readings[0]!])
        return b
      },
      'readings',
    ],
  ]

  it.each(cases)('with %s → 400 naming the field, nothing written', async (_name, spoil, field) => {
    const target = await emptyOrganization(`spoiled-${Math.random().toString(36).slice(2)}-${stamp}@marrowfen.example`)
    const spoiled = spoil(structuredClone(file))
    const res = await restore(target.owner.token, JSON.stringify(spoiled))
    expect(res.status, JSON.stringify(res.body)).toBe(400)
    expect(Object.keys(res.body.error.fields)).toContain(field)
    const [counts] = (await t.ctx.sequelize.query(
      `SELECT (SELECT count(*) FROM sites WHERE organization_id = $1) AS sites, (SELECT count(*) FROM tanks WHERE organization_id = $1) AS tanks,
              (SELECT name FROM organizations WHERE id = $1) AS name`,
      { bind: [target.organizationId], type: QueryTypes.SELECT },
    )) as Array<{ sites: number; tanks: number; name: string }>
    expect(counts).toEqual({ sites: 0, tanks: 0, name: 'New organization' })
  })

  it('of format version 2, from before visits were kept, restores without visits', async () => {
    const target = await emptyOrganization(`version2-${stamp}@marrowfen.example`)
    // Without its reading, which the shape organization still holds (a reading's key is its source's).
    const older: Backup = { ...structuredClone(file), formatVersion: 2, readings: [] }
    delete older.tables.visits
    const res = await restore(target.owner.token, JSON.stringify(older))
    expect(res.status, JSON.stringify(res.body)).toBe(201)
    expect(res.body.rows).toMatchObject({ tanks: 1, visits: 0 })
  })

  it('that is not JSON at all → 400', async () => {
    const target = await emptyOrganization(`nojson-${stamp}@marrowfen.example`)
    const res = await restore(target.owner.token, '{"format": "tankwarden-organization-backup", ')
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ file: 'not valid JSON' })
  })

  it('with no file → 400 naming the file', async () => {
    const target = await emptyOrganization(`nofile-${stamp}@marrowfen.example`)
    const res = await t.api().post('/api/v1/backup/restore').set(bearer(target.owner.token)).field('note', 'x')
    expect(res.status).toBe(400)
    expect(res.body.error.fields).toEqual({ file: 'required' })
  })
})
