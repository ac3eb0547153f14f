import { randomBytes } from 'node:crypto'
import bcrypt from 'bcryptjs'
import { QueryTypes, type Transaction } from 'sequelize'
import { z } from 'zod'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { AppError, badRequest, conflict, fromZod } from '../platform/errors'
import { BACKUP_FORMAT, READABLE_BACKUP_VERSIONS } from '@shared/schemas/exports'
import { BACKUP_TABLES, mapIds, readingTupleSchema, referenceOf, rowSchema, type BackupTable } from './backup-tables'
import { perContext } from '../platform/per-context'
import { insertRestoredReadings } from '../readings'
import type { RestoreSummary } from '@shared/schemas/exports'

const READING_CHUNK = 5000
type Row = Record<string, unknown>
type Backup = { organization: { name: string }; tables: Record<string, Row[]>; readings: Array<z.infer<typeof readingTupleSchema>> }

const backupSchema = z.object({
  format: z.literal(BACKUP_FORMAT, { message: 'not a Tankwarden organization backup' }),
  formatVersion: z.union(
    READABLE_BACKUP_VERSIONS.map((version) => z.literal(version)),
    { message: `this server restores format versions ${READABLE_BACKUP_VERSIONS.join(' and ')}` },
  ),
  organization: z.object({ name: z.string().trim().min(1).max(200) }),
  tables: z.object(
    Object.fromEntries(
      (BACKUP_TABLES as readonly BackupTable[]).map((spec) => {
        const rows = z.array(rowSchema(spec))
        return [spec.table, spec.sinceVersion ? rows.default([]) : rows]
      }),
    ),
  ),
  readings: z.array(readingTupleSchema),
})

/** Reads and checks a backup file completely before anything is written. */
export function parseBackup(file: Buffer): Backup {
  let document: unknown
  try {
    document = JSON.parse(file.toString('utf8'))
  } catch {
    throw new AppError(400, 'invalid_backup', 'The file is not valid JSON', { file: 'not valid JSON' })
  }
  const result = backupSchema.safeParse(document)
  if (!result.success) {
    const error = fromZod(result.error, 'body')
    throw new AppError(400, 'invalid_backup', `The backup is not valid: ${error.message}`, error.fields)
  }
  const backup = result.data as Backup
  checkReferences(backup)
  return backup
}

/** Every id a row points at must be a row of the backup, so the restore never needs a guess. */
function checkReferences(backup: Backup) {
  const ids = new Map<string, Set<number>>()
  for (const spec of BACKUP_TABLES) {
    if (spec.hasId) ids.set(spec.table, new Set(backup.tables[spec.table]!.map((row) => row.id as number)))
  }
  const refuse = (field: string, message: string) => new AppError(400, 'invalid_backup', `The backup is not valid: ${field}: ${message}`, { [field]: message })
  for (const spec of BACKUP_TABLES as readonly BackupTable[]) {
    const seen = new Set<number>()
    backup.tables[spec.table]!.forEach((row, index) => {
      if (spec.hasId) {
        if (seen.has(row.id as number)) throw refuse(`tables.${spec.table}.${index}.id`, 'appears twice')
        seen.add(row.id as number)
      }
      for (const column of Object.keys(spec.columns)) {
        mapIds(spec, column, row[column], (table, id) => {
          if (!ids.get(table)!.has(id)) throw refuse(`tables.${spec.table}.${index}.${column}`, `no ${table} row has id ${id}`)
          return id
        })
      }
    })
  }
  backup.readings.forEach(([tankId, , , , , sourceKey], index) => {
    if (!ids.get('tanks')!.has(tankId)) throw refuse(`readings.${index}.0`, `no tanks row has id ${tankId}`)
    const source = /^([dk]):(\d+)$/.exec(sourceKey)
    if (source && !ids.get(source[1] === 'd' ? 'devices' : 'test_kit_entries')!.has(Number(source[2]))) {
      throw refuse(`readings.${index}.5`, `${sourceKey} names a ${source[1] === 'd' ? 'device' : 'test-kit entry'} that is not in the backup`)
    }
  })
}

const quote = (name: string) => `"${name}"`

export const backupImportService = perContext((ctx: AppContext) => {
  const { sequelize } = ctx

  /** New ids for a table, ascending in the same order as the old ones, so the restored order matches. */
  async function allocateIds(table: string, oldIds: number[], transaction: Transaction): Promise<Map<number, number>> {
    const map = new Map<number, number>()
    if (oldIds.length === 0) return map
    const fresh = (await sequelize.query(`SELECT nextval(pg_get_serial_sequence('${table}', 'id'))::bigint AS id FROM generate_series(1, $1)`, {
      bind: [oldIds.length],
      transaction,
      type: QueryTypes.SELECT,
    })) as Array<{ id: number }>
    const sortedNew = fresh.map((r) => Number(r.id)).sort((a, b) => a - b)
    ;[...oldIds].sort((a, b) => a - b).forEach((old, i) => map.set(old, sortedNew[i]!))
    return map
  }

  async function assertEmpty(actor: UserActor, transaction: Transaction) {
    await sequelize.query('SELECT id FROM organizations WHERE id = $1 FOR UPDATE', { bind: [actor.organizationId], transaction })
    const [counts] = (await sequelize.query(
      `SELECT (SELECT count(*) FROM sites WHERE organization_id = $1) AS sites,
              (SELECT count(*) FROM users WHERE organization_id = $1 AND id <> $2) AS users`,
      { bind: [actor.organizationId, actor.userId], transaction, type: QueryTypes.SELECT },
    )) as Array<{ sites: number; users: number }>
    if (Number(counts!.sites) > 0 || Number(counts!.users) > 0) {
      throw conflict(
        'organization_not_empty',
        'A backup can only be restored into an empty organization (no sites, and no people but you). Create a new organization for the restore.',
      )
    }
  }

  async function assertEmailsFree(users: Row[], ownEmail: string, transaction: Transaction) {
    const wanted = users.map((u) => String(u.email).toLowerCase()).filter((email) => email !== ownEmail)
    if (wanted.length === 0) return
    const taken = (await sequelize.query('SELECT lower(email) AS email FROM users WHERE lower(email) = ANY($1)', {
      bind: [wanted],
      transaction,
      type: QueryTypes.SELECT,
    })) as Array<{ email: string }>
    if (taken.length) {
      const fields = Object.fromEntries(taken.map(({ email }) => [`users.${email}`, 'already has an account in another organization']))
      throw conflict('emails_taken', `These people already have accounts elsewhere: ${taken.map((t) => t.email).join(', ')}`, fields)
    }
  }

  return {
    /** Restores a checked backup into the actor's empty organization, all in one transaction. */
    async restore(actor: UserActor, backup: Backup): Promise<RestoreSummary> {
      const me = await ctx.models.User.findByPk(actor.userId)
      const ownEmail = me!.email.toLowerCase()
      // Restored people get a password nobody knows; they choose their own through the reset flow.
      const unusableHash = await bcrypt.hash(randomBytes(32).toString('hex'), 10)
      const unusableDeviceHash = randomBytes(32).toString('hex')
      const maps = new Map<string, Map<number, number>>()
      const rowsRestored: Record<string, number> = {}
      let step = 'organization'
      try {
        return await sequelize.transaction(async (transaction) => {
          await assertEmpty(actor, transaction)
          await assertEmailsFree(backup.tables.users!, ownEmail, transaction)
          for (const spec of BACKUP_TABLES as readonly BackupTable[]) {
            step = `tables.${spec.table}`
            let rows = backup.tables[spec.table]!
            if (spec.hasId) {
              let oldIds = rows.map((row) => row.id as number)
              const preset = new Map<number, number>()
              if (spec.table === 'users') {
                // The person restoring is already here: their row in the backup becomes them.
                const mine = rows.find((row) => String(row.email).toLowerCase() === ownEmail)
                if (mine) preset.set(mine.id as number, actor.userId)
                rows = rows.filter((row) => row !== mine)
                oldIds = rows.map((row) => row.id as number)
              }
              const map = await allocateIds(spec.table, oldIds, transaction)
              for (const [old, fresh] of preset) map.set(old, fresh)
              maps.set(spec.table, map)
            }
            rowsRestored[spec.table] = rows.length
            if (rows.length) await insertRows(spec, rows, actor.organizationId, maps, { unusableHash, unusableDeviceHash }, transaction)
          }
          for (const spec of BACKUP_TABLES as readonly BackupTable[]) {
            for (const column of spec.deferred ?? []) {
              step = `tables.${spec.table}`
              const target = maps.get(referenceOf(spec.columns[column]!)!.table)!
              const updates = backup.tables[spec.table]!.filter((row) => row[column] !== null).map((row) => ({
                id: maps.get(spec.table)!.get(row.id as number),
                value: target.get(row[column] as number),
              }))
              if (updates.length) {
                await sequelize.query(
                  `UPDATE "${spec.table}" SET ${quote(column)} = v.value FROM json_to_recordset($1::json) AS v(id integer, value integer) WHERE "${spec.table}".id = v.id`,
                  { bind: [JSON.stringify(updates)], transaction },
                )
              }
            }
          }
          step = 'readings'
          await insertReadings(backup.readings, maps, transaction)
          step = 'organization'
          await ctx.models.Organization.update({ name: backup.organization.name }, { where: { id: actor.organizationId }, transaction })
          return { organizationName: backup.organization.name, rows: rowsRestored, readings: backup.readings.length, notes: [] }
        })
      } catch (error) {
        const code = (error as { parent?: { code?: string } }).parent?.code ?? ''
        // Values the schema let through but PostgreSQL refuses (a check, a duplicate): the file's fault.
        if (/^2[23]/.test(code)) {
          const detail = (error as { parent?: { message?: string } }).parent?.message ?? 'refused'
          throw badRequest(`The backup could not be restored, nothing was written: ${step}: ${detail}`, { [step]: detail })
        }
        throw error
      }
    },
  }

  async function insertRows(
    spec: BackupTable,
    rows: Row[],
    organizationId: number,
    maps: Map<string, Map<number, number>>,
    secrets: { unusableHash: string; unusableDeviceHash: string },
    transaction: Transaction,
  ) {
    const columns = Object.keys(spec.columns).filter((column) => !spec.deferred?.includes(column))
    const remapped = rows.map((row) => {
      const out: Row = {}
      if (spec.hasId) out.id = maps.get(spec.table)!.get(row.id as number)
      for (const column of columns) out[column] = mapIds(spec, column, row[column], (table, id) => maps.get(table)!.get(id))
      return out
    })
    const targets = [...(spec.hasId ? ['id'] : []), ...columns]
    const values = targets.map((column) => `x.${quote(column)}`)
    const extra: Array<[string, string]> = []
    if (!spec.scope) extra.push(['organization_id', '$2::integer'])
    if (spec.table === 'users') extra.push(['password_hash', '$3::text'])
    if (spec.table === 'devices') extra.push(['token_hash', '$3::text'])
    const bind: unknown[] = [JSON.stringify(remapped), organizationId]
    if (spec.table === 'users') bind.push(secrets.unusableHash)
    if (spec.table === 'devices') bind.push(secrets.unusableDeviceHash)
    await sequelize.query(
      `INSERT INTO "${spec.table}" (${[...targets, ...extra.map(([c]) => c)].map(quote).join(', ')})
       SELECT ${[...values, ...extra.map(([, v]) => v)].join(', ')} FROM json_populate_recordset(NULL::"${spec.table}", $1::json) AS x`,
      { bind: spec.scope ? [bind[0]] : bind, transaction },
    )
  }

  async function insertReadings(readings: Backup['readings'], maps: Map<string, Map<number, number>>, transaction: Transaction) {
    const tanks = maps.get('tanks')!
    const devices = maps.get('devices')!
    const entries = maps.get('test_kit_entries')!
    const sourceKey = (key: string) => {
      const match = /^([dk]):(\d+)$/.exec(key)
      if (!match) return key
      return `${match[1]}:${(match[1] === 'd' ? devices : entries).get(Number(match[2]))}`
    }
    for (let start = 0; start < readings.length; start += READING_CHUNK) {
      const chunk = readings.slice(start, start + READING_CHUNK)
      await insertRestoredReadings(
        sequelize,
        {
          tankIds: chunk.map((r) => tanks.get(r[0])),
          metrics: chunk.map((r) => r[1]),
          times: chunk.map((r) => r[2]),
          values: chunk.map((r) => r[3]),
          sources: chunk.map((r) => r[4]),
          sourceKeys: chunk.map((r) => sourceKey(r[5])),
        },
        transaction,
      )
    }
  }
})
