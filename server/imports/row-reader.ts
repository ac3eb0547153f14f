import type { ImportMapping, RejectionReason } from '@shared/schemas/imports'
import type { FileReading } from '../readings'
import { createTimeReader } from './time-formats'

/** Imported readings of one tank share a source key, so a value already imported at that time is a duplicate whatever file brings it. */
export const importSourceKey = (tankId: number) => `i:${tankId}`

const NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/

export type RowProblem = { reason: RejectionReason; detail: string; column: string; value: string }

export type ReadRow = { ok: true; readings: FileReading[]; columns: string[] } | { ok: false; problems: RowProblem[] }

/** Sorts a checker's reason into the report's reason codes. */
export function reasonOf(detail: string): RejectionReason {
  if (detail.startsWith('implausible')) return 'implausible_value'
  if (detail.includes('in the future')) return 'time_in_future'
  if (detail.includes('older than')) return 'too_old'
  return 'invalid'
}

/** Turns one CSV record into readings (or the reasons it cannot be read) under a confirmed mapping. */
export function createRowReader(
  header: string[],
  mapping: ImportMapping,
  options: { delimiter: string; fixedTankId: number | null; tanksByName: Map<string, number> },
) {
  const at = (name: string) => header.indexOf(name)
  const timeIndex = at(mapping.timeColumn)
  const tankIndex = mapping.tankColumn ? at(mapping.tankColumn) : -1
  const columns = mapping.metrics.map((m) => ({ ...m, index: at(m.column) }))
  const readTime = createTimeReader(mapping.timeFormat, mapping.timeZone)
  // With ';' or tab as delimiter, "24,5" is a decimal comma, as spreadsheets in many countries write it.
  const decimalComma = options.delimiter !== ','

  function number(cell: string): number | null {
    const text = decimalComma && /^[-+]?\d+,\d+$/.test(cell) ? cell.replace(',', '.') : cell
    return NUMBER.test(text) ? Number(text) : null
  }

  return (record: string[]): ReadRow => {
    const problems: RowProblem[] = []
    const timeCell = record[timeIndex] ?? ''
    const ms = readTime(timeCell)
    if (ms === null)
      problems.push({ reason: 'unparseable_time', detail: `"${timeCell}" is not a ${mapping.timeFormat} time`, column: mapping.timeColumn, value: timeCell })
    let tankId = options.fixedTankId
    if (tankIndex >= 0) {
      const name = (record[tankIndex] ?? '').trim()
      tankId = options.tanksByName.get(name.toLowerCase()) ?? null
      if (tankId === null)
        problems.push({
          reason: 'unknown_tank',
          detail: name ? `no tank named "${name}" at this site` : 'no tank name',
          column: mapping.tankColumn!,
          value: name,
        })
    }
    const readings: FileReading[] = []
    const used: string[] = []
    for (const c of columns) {
      const cell = (record[c.index] ?? '').trim()
      if (!cell) continue
      const value = number(cell)
      if (value === null) {
        problems.push({ reason: 'bad_number', detail: `"${cell}" is not a number`, column: c.column, value: cell })
        continue
      }
      if (ms !== null && tankId !== null) {
        readings.push({ sourceKey: importSourceKey(tankId), tankId, metric: c.metric, value, unit: c.unit, time: new Date(ms) })
        used.push(c.column)
      }
    }
    if (!problems.length && !readings.length) problems.push({ reason: 'invalid', detail: 'no value in any mapped column', column: '', value: '' })
    return problems.length ? { ok: false, problems } : { ok: true, readings, columns: used }
  }
}
