// Tanks from a spreadsheet: one row per tank with its name, site, kind, volume and heater set
// point. The rows are checked here, whole, before anything is written.
import { z } from 'zod'
import { suggestHeaterWatts } from './build/equipment'
import { TANK_KIND_LABELS, TANK_KINDS, type TankKind } from './schemas/tanks'

export const MAX_IMPORTED_TANKS = 500
/** The room the heater works against when the sheet does not say (the build planner's default). */
const ROOM_C = 20

export const tankImportBodySchema = z.object({
  csv: z.string().min(1, 'the file is empty').max(200_000, 'at most 200 000 characters; split the sheet'),
})
export type TankImportBody = z.infer<typeof tankImportBodySchema>

const COLUMNS = {
  name: ['name', 'tank', 'tank name'],
  site: ['site', 'site name', 'location'],
  kind: ['kind', 'type', 'water'],
  volume: ['volume', 'volume (l)', 'litres', 'liters', 'volume l', 'volume litres'],
  setPoint: ['set point', 'setpoint', 'set point (°c)', 'set point c', 'temperature set point', 'heater set point'],
} as const
type Column = keyof typeof COLUMNS
const REQUIRED: Column[] = ['name', 'site', 'kind', 'volume']

/** A tank as the sheet gives it, ready for the site's id. */
export interface ImportedTankRow {
  /** Its row in the sheet as a spreadsheet numbers it (the headers are row 1). */
  row: number
  name: string
  siteName: string
  kind: TankKind
  volumeLitres: number
  /** The heater a set point implies: its size by the usual rule of thumb, its top at the floor until measured. */
  heater: { watts: number; setPointC: number; topCm: number } | null
}

export type TankImportResult = { rows: ImportedTankRow[]; errors: Record<string, string> }

const squash = (s: string) => s.trim().toLowerCase().replace(/\s+/g, ' ')

function kindOf(text: string): TankKind | null {
  const t = squash(text).replace(/[_-]/g, ' ')
  for (const kind of TANK_KINDS) if (t === kind.replace(/_/g, ' ') || t === TANK_KIND_LABELS[kind].toLowerCase()) return kind
  if (t === 'tropical' || t === 'freshwater') return 'tropical_freshwater'
  if (t === 'saltwater' || t === 'reef') return 'marine'
  return null
}

/** A number as people type it in a sheet: "120", "120.5", "120,5", "120 L". */
function numberOf(text: string, unit: RegExp): number | null {
  const t = text.trim().replace(unit, '').trim().replace(',', '.')
  return /^\d+(\.\d+)?$/.test(t) ? Number(t) : null
}

/**
 * Rows of a parsed sheet (its first row the headers) as tanks, or every problem by row and column
 * ("row 3, kind"), counting rows as a spreadsheet shows them (the headers are row 1).
 */
export function tanksFromSheet(records: string[][]): TankImportResult {
  const errors: Record<string, string> = {}
  const [header = [], ...body] = records
  const at: Partial<Record<Column, number>> = {}
  header.forEach((h, i) => {
    const word = squash(h)
    for (const [column, names] of Object.entries(COLUMNS) as Array<[Column, readonly string[]]>) if (names.includes(word) && at[column] == null) at[column] = i
  })
  const missing = REQUIRED.filter((c) => at[c] == null)
  if (missing.length) return { rows: [], errors: { columns: `the first row must name the columns ${missing.join(', ')} (set point is optional)` } }
  const lines = body.map((cells, i) => ({ cells, row: i + 2 })).filter(({ cells }) => cells.some((c) => c.trim()))
  if (!lines.length) return { rows: [], errors: { rows: 'no tanks below the headers' } }
  if (lines.length > MAX_IMPORTED_TANKS) return { rows: [], errors: { rows: `at most ${MAX_IMPORTED_TANKS} tanks at once` } }

  const rows: ImportedTankRow[] = []
  const seen = new Set<string>()
  for (const { cells, row } of lines) {
    const cell = (c: Column) => (at[c] == null ? '' : (cells[at[c]!] ?? '').trim())
    const fail = (column: string, message: string) => (errors[`row ${row}, ${column}`] = message)
    const name = cell('name')
    const siteName = cell('site')
    const kind = kindOf(cell('kind'))
    const volume = numberOf(cell('volume'), /\s*(l|litres|liters)$/i)
    const setPointText = cell('setPoint')
    const setPoint = setPointText ? numberOf(setPointText, /\s*°?\s*c$/i) : null
    if (!name) fail('name', 'required')
    else if (name.length > 120) fail('name', 'at most 120 characters')
    if (!siteName) fail('site', 'required')
    if (!kind) fail('kind', `one of ${TANK_KINDS.map((k) => TANK_KIND_LABELS[k]).join(', ')}`)
    if (volume == null || volume <= 0 || volume > 100_000) fail('volume', 'litres, above 0 and at most 100 000')
    if (setPointText && (setPoint == null || setPoint < 5 || setPoint > 35)) fail('set point', '°C from 5 to 35, or empty for no heater')
    const key = `${squash(siteName)}|${squash(name)}`
    if (name && siteName && seen.has(key)) fail('name', 'named twice for the same site')
    seen.add(key)
    if (!name || !siteName || !kind || volume == null || volume <= 0 || volume > 100_000) continue
    if (setPointText && (setPoint == null || setPoint < 5 || setPoint > 35)) continue
    const heater = setPoint == null ? null : { watts: suggestHeaterWatts(volume, setPoint, ROOM_C).watts, setPointC: setPoint, topCm: 0 }
    rows.push({ row, name, siteName, kind, volumeLitres: volume, heater })
  }
  return { rows: Object.keys(errors).length ? [] : rows, errors }
}
