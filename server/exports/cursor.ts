import { QueryTypes, Transaction, type Sequelize } from 'sequelize'

const BATCH_ROWS = 2000
let cursorCounter = 0

/**
 * Reads a query in batches through a PostgreSQL cursor, so an export of millions of rows holds one
 * batch in memory at a time. Runs inside `transaction` (callers hold one open for a consistent
 * snapshot); `onBatch` may wait (for a slow client) before the next batch is fetched.
 */
export async function eachBatch<Row>(
  sequelize: Sequelize,
  transaction: Transaction,
  sql: string,
  replacements: Record<string, unknown>,
  onBatch: (rows: Row[]) => Promise<boolean | void>,
): Promise<void> {
  const cursor = `export_cursor_${++cursorCounter}`
  await sequelize.query(`DECLARE ${cursor} NO SCROLL CURSOR FOR ${sql}`, { transaction, replacements })
  for (;;) {
    const rows = (await sequelize.query(`FETCH ${BATCH_ROWS} FROM ${cursor}`, { transaction, type: QueryTypes.SELECT })) as Row[]
    if (rows.length === 0) break
    // A handler answering false wants no more rows (the client went away).
    if ((await onBatch(rows)) === false) break
    if (rows.length < BATCH_ROWS) break
  }
  await sequelize.query(`CLOSE ${cursor}`, { transaction })
}

/** A read-only snapshot transaction: every table of one export sees the same moment. */
export function snapshot(sequelize: Sequelize) {
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ, readOnly: true })
}
