import { z } from 'zod'
import { instantSchema } from '@shared/schemas/time'
import { ROLLUP_BACKUP_TABLES } from '../readings'

/**
 * What an organization backup holds, table by table, in the order a restore inserts them.
 * Columns are named as in PostgreSQL. A column typed `->table` is an id of that table's rows and
 * is remapped on restore; a trailing `?` allows null; `->table[]` is a list of such ids. Secrets never leave: no password
 * or token hashes, no sessions, invitations, wall keys, reset or acknowledge links, no mail, no push
 * devices, no photos.
 */
type Kind = 'text' | 'int' | 'float' | 'bool' | 'time' | 'date' | 'json' | 'text[]'
export type BackupTableName = (typeof BACKUP_TABLES)[number]['table']
type Column = Kind | `${Kind}?` | `->${string}` | `->${string}?` | `->${string}[]`

/**
 * A JSON column that holds ids of other tables: its shape, checked before anything is written, and
 * one walk over it that rewrites every id through `id` (the restore remaps with it; the check
 * refuses an id the backup lacks).
 */
export interface IdsInJson {
  schema: z.ZodType
  remap(value: unknown, id: (table: string, old: number) => unknown): unknown
}

export interface BackupTable {
  table: string
  columns: Record<string, Column>
  /** Rows have a serial `id` the backup carries, so other tables can point at them. */
  hasId: boolean
  /** Which rows belong to the organization `:organizationId`, for tables without that column. */
  scope?: string
  /** References written after every table is in (a cycle, or a table pointing at itself). */
  deferred?: string[]
  /** JSON columns with ids inside (their column is `json`). */
  idsInJson?: Record<string, IdsInJson>
  /** The format version that added the table: a file of an earlier version restores it empty. */
  sinceVersion?: number
  order: string
}

const idValue = z.number().int().positive()

/** A closed visit's work per tank: the tank, the care tasks ticked and the test-kit entry made there. */
const visitWork: IdsInJson = {
  schema: z
    .array(
      z.looseObject({
        tankId: idValue,
        doneTasks: z.array(z.looseObject({ id: idValue })).max(1000),
        kitEntryId: idValue.nullable(),
      }),
    )
    .max(1000),
  remap: (value, id) =>
    (value as Array<{ tankId: number; doneTasks: Array<{ id: number }>; kitEntryId: number | null }>).map((work) => ({
      ...work,
      tankId: id('tanks', work.tankId),
      doneTasks: work.doneTasks.map((task) => ({ ...task, id: id('care_tasks', task.id) })),
      kitEntryId: work.kitEntryId === null ? null : id('test_kit_entries', work.kitEntryId),
    })),
}

export const BACKUP_TABLES = [
  {
    table: 'clients',
    hasId: true,
    order: 'id',
    columns: {
      kind: 'text',
      name: 'text',
      contact_name: 'text',
      email: 'text',
      phone: 'text',
      address: 'text',
      notes: 'text',
      archived_at: 'time?',
    },
  },
  {
    table: 'users',
    hasId: true,
    order: 'id',
    columns: { email: 'text', name: 'text', role: 'text', active: 'bool', unit_preferences: 'json', client_id: '->clients?' },
  },
  {
    table: 'sites',
    hasId: true,
    order: 'id',
    columns: { name: 'text', time_zone: 'text', address: 'text', notes: 'text', archived_at: 'time?', backup_user_id: '->users?', workday_end: 'text?' },
  },
  {
    table: 'user_sites',
    hasId: false,
    order: 'user_id, site_id',
    scope: 'user_id IN (SELECT id FROM users WHERE organization_id = :organizationId)',
    columns: { user_id: '->users', site_id: '->sites' },
  },
  {
    table: 'tanks',
    hasId: true,
    order: 'id',
    columns: {
      site_id: '->sites',
      client_id: '->clients?',
      name: 'text',
      kind: 'text',
      stage: 'text',
      dimensions: 'json?',
      volume_litres: 'float',
      volume_source: 'text',
      substrate_depth_cm: 'float',
      heater: 'json?',
      filter: 'text',
      media: 'text',
      light_schedule: 'json?',
      targets: 'json',
      notes: 'text',
      sort_order: 'int',
      archived_at: 'time?',
    },
  },
  {
    table: 'devices',
    hasId: true,
    order: 'id',
    columns: { tank_id: '->tanks', name: 'text', metrics: 'text[]', interval_seconds: 'int', revoked_at: 'time?', self_calibrating: 'bool' },
  },
  {
    // Readings keep their corrected values; which calibration corrected each stays behind.
    table: 'calibrations',
    hasId: true,
    order: 'id',
    columns: {
      device_id: '->devices',
      metric: 'text',
      method: 'text',
      points: 'json',
      gain: 'float',
      intercept: 'float',
      slope_percent: 'float?',
      offset_mv: 'float?',
      slope_ok: 'bool?',
      performed_at: 'time',
      performed_by: '->users?',
      notes: 'text',
    },
  },
  {
    table: 'watch_rules',
    hasId: true,
    order: 'id',
    deferred: ['overrides_rule_id'],
    columns: {
      site_id: '->sites',
      tank_id: '->tanks?',
      overrides_rule_id: '->watch_rules?',
      name: 'text',
      severity: 'text',
      spec: 'json',
      enabled: 'bool',
      created_by: '->users?',
    },
  },
  {
    table: 'maintenance_windows',
    hasId: true,
    order: 'id',
    columns: {
      site_id: '->sites',
      tank_id: '->tanks?',
      rule_id: '->watch_rules?',
      reason: 'text',
      starts_at: 'time?',
      ends_at: 'time?',
      weekday: 'int?',
      start_minute: 'int?',
      duration_minutes: 'int?',
      created_by: '->users?',
      cancelled_at: 'time?',
    },
  },
  {
    table: 'site_incidents',
    hasId: true,
    order: 'id',
    columns: {
      site_id: '->sites',
      cause: 'text',
      severity: 'text',
      title: 'text',
      state: 'text',
      opened_at: 'time',
      acknowledged_at: 'time?',
      acknowledged_by: '->users?',
      resolved_at: 'time?',
      escalation_level: 'int',
      next_escalation_at: 'time?',
      notify_at: 'time?',
    },
  },
  {
    table: 'incidents',
    hasId: true,
    order: 'id',
    columns: {
      site_id: '->sites',
      tank_id: '->tanks',
      rule_id: '->watch_rules?',
      rule_kind: 'text',
      metric: 'text',
      severity: 'text',
      title: 'text',
      state: 'text',
      condition_since: 'time',
      opened_at: 'time',
      first_value: 'float?',
      peak_value: 'float?',
      latest_value: 'float?',
      latest_at: 'time?',
      snoozed: 'bool',
      acknowledged_at: 'time?',
      acknowledged_by: '->users?',
      acknowledge_note: 'text?',
      resolved_at: 'time?',
      resolved_by: '->users?',
      resolve_note: 'text?',
      escalation_level: 'int',
      next_escalation_at: 'time?',
      next_repeat_at: 'time?',
      top_severity: 'text',
      flap_count: 'int',
      last_flap_at: 'time?',
      settle_until: 'time?',
      all_clear_at: 'time?',
      recheck_at: 'time?',
      notify_at: 'time?',
      maintenance: 'bool',
      cause: 'text?',
      site_incident_id: '->site_incidents?',
    },
  },
  {
    table: 'incident_events',
    hasId: true,
    order: 'id',
    scope: 'incident_id IN (SELECT id FROM incidents WHERE organization_id = :organizationId)',
    columns: { incident_id: '->incidents', at: 'time', kind: 'text', user_id: '->users?', detail: 'json' },
  },
  {
    table: 'snoozes',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      reason: 'text',
      starts_at: 'time',
      ends_at: 'time',
      weekly: 'bool',
      repeat_until: 'time?',
      include_heater_line: 'bool',
      created_by: '->users?',
      reminded_at: 'time?',
      cancelled_at: 'time?',
    },
  },
  {
    table: 'duty_shifts',
    hasId: true,
    order: 'id',
    columns: { site_id: '->sites', user_id: '->users', weekday: 'int', start_time: 'text', end_time: 'text' },
  },
  {
    table: 'duty_overrides',
    hasId: true,
    order: 'id',
    columns: { site_id: '->sites', user_id: '->users', kind: 'text', starts_at: 'time', ends_at: 'time', note: 'text', created_by: '->users?' },
  },
  {
    table: 'consumables',
    hasId: true,
    order: 'id',
    columns: {
      site_id: '->sites',
      kind: 'text',
      name: 'text',
      unit: 'text',
      quantity: 'float',
      low_at: 'float?',
      expires_on: 'date?',
      notes: 'text',
    },
  },
  {
    table: 'treatment_courses',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      product: 'text',
      dose: 'json',
      days: 'int',
      dose_every_days: 'int',
      starts_on: 'date',
      ends_on: 'date',
      tests: 'json',
      notes: 'text',
      stopped_at: 'time?',
      stopped_by: '->users?',
      created_by: '->users?',
    },
  },
  {
    table: 'care_tasks',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      kind: 'text',
      title: 'text',
      recurrence: 'json',
      default_values: 'json',
      starts_on: 'date?',
      ends_on: 'date?',
      treatment_course_id: '->treatment_courses?',
      last_done_at: 'time?',
      last_done_by: '->users?',
      snoozed_until: 'time?',
      snooze_reason: 'text?',
      active: 'bool',
      created_by: '->users?',
      consumable_id: '->consumables?',
      consumable_amount: 'float?',
    },
  },
  {
    table: 'equipment',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      kind: 'text',
      name: 'text',
      model: 'text',
      watts: 'float?',
      installed_on: 'date',
      service_action: 'text',
      service_every_days: 'int?',
      care_task_id: '->care_tasks?',
      notes: 'text',
      retired_at: 'time?',
      created_by: '->users?',
    },
  },
  {
    table: 'tank_builds',
    hasId: true,
    order: 'id',
    columns: { tank_id: '->tanks', plan: 'json', filled_on: 'date?', finished_at: 'time?', created_by: '->users?' },
  },
  {
    table: 'build_steps',
    hasId: true,
    order: 'id',
    scope: 'build_id IN (SELECT id FROM tank_builds WHERE organization_id = :organizationId)',
    columns: {
      build_id: '->tank_builds',
      tank_id: '->tanks',
      key: 'text',
      title: 'text',
      day: 'int',
      until_day: 'int?',
      due_on: 'date',
      care_task_id: '->care_tasks?',
      done_at: 'time?',
      done_by: '->users?',
      notes: 'text',
    },
  },
  {
    table: 'water_changes',
    hasId: true,
    order: 'id',
    deferred: ['care_log_entry_id'],
    columns: {
      tank_id: '->tanks',
      status: 'text',
      plan: 'json',
      heater_off_confirmed: 'bool',
      temporary_rule_id: '->watch_rules?',
      started_at: 'time',
      started_by: '->users?',
      finished_at: 'time?',
      finished_by: '->users?',
      litres_replaced: 'float?',
      dechlorinator_ml: 'float?',
      new_water_temp_c: 'float?',
      care_log_entry_id: '->care_log?',
    },
  },
  {
    table: 'care_log',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      kind: 'text',
      at: 'time',
      user_id: '->users?',
      text: 'text',
      values: 'json',
      care_task_id: '->care_tasks?',
      water_change_id: '->water_changes?',
    },
  },
  {
    table: 'livestock',
    hasId: true,
    order: 'id',
    columns: {
      tank_id: '->tanks',
      species_key: 'text?',
      name: 'text',
      category: 'text',
      count: 'int',
      losses: 'int',
      added_at: 'time',
      source: 'text',
      notes: 'text',
      removed_at: 'time?',
      watch_until: 'time?',
      created_by: '->users?',
      parent_id: '->livestock?',
      moved_out: 'int',
    },
    deferred: ['parent_id'],
  },
  {
    table: 'livestock_events',
    hasId: true,
    order: 'id',
    columns: {
      livestock_id: '->livestock',
      kind: 'text',
      at: 'time',
      count: 'int',
      from_tank_id: '->tanks?',
      to_tank_id: '->tanks?',
      split_id: '->livestock?',
      cause: 'text',
      destination: 'text',
      user_id: '->users?',
    },
  },
  {
    table: 'test_kit_entries',
    hasId: true,
    order: 'id',
    columns: { tank_id: '->tanks', entered_by: '->users?', taken_at: 'time', values: 'json', notes: 'text', deleted_at: 'time?' },
  },
  {
    table: 'test_kit_entry_revisions',
    hasId: true,
    order: 'id',
    scope: 'entry_id IN (SELECT id FROM test_kit_entries WHERE organization_id = :organizationId)',
    columns: { entry_id: '->test_kit_entries', action: 'text', changed_by: '->users?', snapshot: 'json' },
  },
  {
    // Photos are not part of a backup, so a visit comes back without its photo list.
    table: 'visits',
    hasId: true,
    order: 'id',
    sinceVersion: 3,
    idsInJson: { work: visitWork },
    columns: {
      client_id: '->clients',
      site_id: '->sites',
      technician_id: '->users',
      starts_at: 'time',
      ends_at: 'time',
      tank_ids: '->tanks[]',
      state: 'text',
      arrived_at: 'time?',
      left_at: 'time?',
      notes: 'text',
      materials: 'json',
      work: 'json',
      closed_at: 'time?',
      closed_by: '->users?',
    },
  },
  ...ROLLUP_BACKUP_TABLES,
] as const satisfies readonly BackupTable[]

/** Readings are many: one array per row, in this column order. */
export const READING_COLUMNS = ['tank_id', 'metric', 'time', 'value', 'source', 'source_key'] as const

export function isOrganizationScoped(spec: BackupTable): boolean {
  return !spec.scope
}

/** The table a reference column points at (`list`: a list of ids), or null for a plain value. */
export function referenceOf(column: Column): { table: string; nullable: boolean; list: boolean } | null {
  if (!column.startsWith('->')) return null
  return { table: column.replace(/^->|\?$|\[\]$/g, ''), nullable: column.endsWith('?'), list: column.endsWith('[]') }
}

/** A column's value with every id it holds rewritten through `id`. */
export function mapIds(spec: BackupTable, column: string, value: unknown, id: (table: string, old: number) => unknown): unknown {
  if (value === null) return null
  const inJson = spec.idsInJson?.[column]
  if (inJson) return inJson.remap(value, id)
  const reference = referenceOf(spec.columns[column]!)
  if (!reference) return value
  return reference.list ? (value as number[]).map((old) => id(reference.table, old)) : id(reference.table, value as number)
}

const MAX_TEXT = 100_000
const instant = instantSchema
const KIND_SCHEMAS: Record<Kind, z.ZodType> = {
  text: z.string().max(MAX_TEXT),
  int: z.number().int(),
  float: z.number().finite(),
  bool: z.boolean(),
  time: instant,
  date: z.iso.date(),
  json: z.json(),
  'text[]': z.array(z.string().max(MAX_TEXT)),
}
function columnSchema(column: Column, inJson?: IdsInJson): z.ZodType {
  if (inJson) return inJson.schema
  const reference = referenceOf(column)
  const base = reference ? (reference.list ? z.array(idValue).max(10_000) : idValue) : KIND_SCHEMAS[column.replace(/\?$/, '') as Kind]
  return column.endsWith('?') ? base.nullable() : base
}

/** The zod schema of one table's rows in a backup file; unknown columns are refused. */
export function rowSchema(spec: BackupTable) {
  const shape: Record<string, z.ZodType> = Object.fromEntries(
    Object.entries(spec.columns).map(([name, column]) => [name, columnSchema(column, spec.idsInJson?.[name])]),
  )
  if (spec.hasId) shape.id = idValue
  return z.strictObject(shape)
}

export const readingTupleSchema = z.tuple([
  idValue,
  z.string().min(1).max(64),
  instant,
  z.number().finite(),
  z.enum(['device', 'test_kit', 'import']),
  z.string().min(1).max(200),
])
