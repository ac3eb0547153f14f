import { once } from 'node:events'
import { createWriteStream } from 'node:fs'
import { stringify, type Stringifier } from 'csv-stringify'
import { guardRow } from '@shared/csv/formula-guard'
import type { RejectionReason } from '@shared/schemas/imports'

export const REPORT_HEADER = ['line', 'reason', 'detail', 'column', 'value', 'row']

export type Rejection = { line: number; reason: RejectionReason; detail: string; column: string; value: string; raw: string[]; delimiter: string }

/** The downloadable CSV of rows that were not stored, opened on the first one and written with backpressure. */
export function createRejectionReport(path: string) {
  let out: Stringifier | null = null
  let finished: Promise<unknown> | null = null
  let count = 0
  return {
    get count() {
      return count
    },
    async add(r: Rejection) {
      if (!out) {
        out = stringify({ header: true, columns: REPORT_HEADER })
        const file = createWriteStream(path)
        finished = once(file, 'finish')
        out.pipe(file)
      }
      count++
      // Every text cell is guarded: the report is opened in spreadsheets, and cells come from the upload.
      const row = guardRow([r.line, r.reason, r.detail, r.column, r.value, r.raw.join(r.delimiter)])
      if (!out.write(row)) await once(out, 'drain')
    },
    async close() {
      if (!out) return false
      out.end()
      await finished
      return true
    },
  }
}
