import { once } from 'node:events'
import type { Writable } from 'node:stream'
import { QueryTypes } from 'sequelize'
import type { UserActor } from '../access/actor'
import type { AppContext } from '../context'
import { BACKUP_FORMAT, BACKUP_FORMAT_VERSION } from '@shared/schemas/exports'
import { BACKUP_TABLES, READING_COLUMNS, type BackupTable } from './backup-tables'
import { eachBatch, snapshot } from './cursor'
import { exportFileName } from './format'
import { perContext } from '../platform/per-context'
import { BACKUP_READINGS_SQL } from '../readings'

/** Told to whoever opens the file, and to whoever restores it. */
export const RESTORE_NOTES = [
  'Devices come back without their tokens: issue each device a new token (Devices, rotate) before it can send again.',
  'People come back without passwords: each one sets a new password through "Forgot password" on the sign-in page.',
  'Wall display keys, invitations, sessions, sent mail and photos are not part of a backup: a restored visit or care entry keeps its words but not its photos.',
]

const ORGANIZATION = 'organization_id = :organizationId'

/** Writes `text` and waits while the client is behind; false once the client has gone. */
async function put(out: Writable, text: string): Promise<boolean> {
  if (out.destroyed) return false
  if (!out.write(text)) await Promise.race([once(out, 'drain'), once(out, 'close')])
  return !out.destroyed
}

export const backupExportService = perContext((ctx: AppContext) => {
  const { sequelize } = ctx

  async function tableRows(spec: BackupTable, organizationId: number, transaction: Parameters<typeof eachBatch>[1]) {
    const columns = [...(spec.hasId ? ['id'] : []), ...Object.keys(spec.columns)]
    // to_jsonb keeps what JavaScript would lose: microseconds of timestamps, exact doubles, dates as dates.
    const rows = (await sequelize.query(`SELECT to_jsonb(x) AS row FROM "${spec.table}" x WHERE ${spec.scope ?? ORGANIZATION} ORDER BY ${spec.order}`, {
      transaction,
      replacements: { organizationId },
      type: QueryTypes.SELECT,
    })) as Array<{ row: Record<string, unknown> }>
    return rows.map(({ row }) => Object.fromEntries(columns.map((column) => [column, row[column] ?? null])))
  }

  return {
    fileName(organizationName: string, at = new Date()) {
      return exportFileName(['tankwarden-backup', organizationName, at.toISOString().slice(0, 10)], 'json')
    },

    /**
     * Streams the organization as one JSON document from one snapshot. The small tables are read
     * whole; readings go through a cursor batch by batch. `begin` runs once the snapshot is open.
     */
    async write(actor: UserActor, out: Writable, begin: (organizationName: string) => void): Promise<void> {
      const organizationId = actor.organizationId
      const transaction = await snapshot(sequelize)
      try {
        const organization = await ctx.models.Organization.findByPk(organizationId, { transaction })
        const tables: Record<string, unknown[]> = {}
        for (const spec of BACKUP_TABLES) tables[spec.table] = await tableRows(spec, organizationId, transaction)
        begin(organization!.name)
        const head = {
          format: BACKUP_FORMAT,
          formatVersion: BACKUP_FORMAT_VERSION,
          exportedAt: new Date().toISOString(),
          restoreNotes: RESTORE_NOTES,
          organization: { name: organization!.name },
          tables,
          readingColumns: READING_COLUMNS,
        }
        let open = await put(out, `${JSON.stringify(head).slice(0, -1)},"readings":[`)
        let first = true
        await eachBatch<{ row: unknown[] }>(sequelize, transaction, BACKUP_READINGS_SQL, { organizationId }, async (rows) => {
          const text = rows.map((r) => JSON.stringify(r.row)).join(',')
          open = await put(out, first ? text : `,${text}`)
          first = false
          return open
        })
        if (open) await put(out, ']}')
        await transaction.commit()
      } catch (error) {
        await transaction.rollback()
        throw error
      }
    },
  }
})
