import { open } from 'node:fs/promises'
import { parse } from 'csv-parse/sync'
import { METRICS, METRIC_KEYS, type MetricKey } from '@shared/metrics/registry'
import type { ImportMapping, ImportPreview } from '@shared/schemas/imports'
import { recordsOf } from './csv-records'
import { detectTimeFormat, looksLikeTime } from './time-formats'

export const SNIFF_BYTES = 64 * 1024
export const PREVIEW_ROWS = 10
const DELIMITERS = [',', ';', '\t', '|'] as const

/** Signatures of files people save by mistake instead of CSV. */
const BINARY_KINDS: Array<[string, number[]]> = [
  ['a spreadsheet workbook (zip); save it as CSV first', [0x50, 0x4b, 0x03, 0x04]],
  ['an old Excel workbook; save it as CSV first', [0xd0, 0xcf, 0x11, 0xe0]],
  ['a PDF document', [0x25, 0x50, 0x44, 0x46]],
  ['a PNG image', [0x89, 0x50, 0x4e, 0x47]],
  ['a JPEG image', [0xff, 0xd8, 0xff]],
  ['a gzip archive', [0x1f, 0x8b]],
]

export class NotCsvError extends Error {}

/** The header line's quoting cannot be read: the file cannot be mapped at all. */
export class UnreadableHeaderError extends Error {
  constructor(
    readonly line: number,
    readonly problem: string,
  ) {
    super(`line ${line}: ${problem}`)
  }
}

export async function readHead(path: string, bytes = SNIFF_BYTES): Promise<Buffer> {
  const handle = await open(path, 'r')
  try {
    const buffer = Buffer.alloc(bytes)
    const { bytesRead } = await handle.read(buffer, 0, bytes, 0)
    return buffer.subarray(0, bytesRead)
  } finally {
    await handle.close()
  }
}

/** Checks by content, not by name or declared type, that the head of a file is UTF-8 text. Answers the text. */
export function assertCsvText(head: Buffer, complete: boolean): string {
  if (!head.length) throw new NotCsvError('The file is empty')
  for (const [what, magic] of BINARY_KINDS) {
    if (magic.every((byte, i) => head[i] === byte)) throw new NotCsvError(`This is not a CSV file: it looks like ${what}`)
  }
  if (head.includes(0)) throw new NotCsvError('This is not a CSV text file: it contains binary data (NUL bytes)')
  // A cut in the middle of a multi-byte character is not an error: drop an incomplete tail.
  let end = head.length
  if (!complete) {
    let back = 0
    while (back < 3 && end - back - 1 >= 0 && (head[end - back - 1]! & 0xc0) === 0x80) back++
    const lead = head[end - back - 1]
    if (lead !== undefined && lead >= 0xc0) end = end - back - 1
  }
  try {
    return new TextDecoder('utf-8', { fatal: true, ignoreBOM: false }).decode(head.subarray(0, end))
  } catch {
    throw new NotCsvError('This is not a UTF-8 CSV text file; save it as CSV (UTF-8)')
  }
}

function completeLines(text: string, complete: boolean): string {
  if (complete) return text
  const cut = text.lastIndexOf('\n')
  return cut > 0 ? text.slice(0, cut + 1) : text
}

/** The delimiter that splits the first lines into the same number (more than one) of columns. */
export function detectDelimiter(text: string): string {
  let best: { delimiter: string; score: number } = { delimiter: ',', score: 0 }
  for (const delimiter of DELIMITERS) {
    try {
      const rows = parse(text, { delimiter, relax_column_count: true, skip_empty_lines: true, to: 30, relax_quotes: true }) as string[][]
      if (!rows.length) continue
      const width = rows[0]!.length
      const consistent = rows.filter((r) => r.length === width).length / rows.length
      const score = width > 1 ? width * consistent : 0
      if (score > best.score) best = { delimiter, score }
    } catch {
      // A delimiter that makes the quoting fail is not the file's delimiter.
    }
  }
  return best.delimiter
}

const normalise = (s: string) =>
  s
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9%/]+/g, ' ')
    .trim()

const METRIC_WORDS: Record<MetricKey, string[]> = {
  temperature: ['temperature', 'temp', 'water temp'],
  ph: ['ph'],
  light: ['light', 'lux', 'illuminance'],
  water_level: ['water level', 'level'],
  ammonia: ['ammonia', 'nh3', 'nh4'],
  nitrite: ['nitrite', 'no2'],
  nitrate: ['nitrate', 'no3'],
  kh: ['kh', 'carbonate hardness', 'alkalinity'],
  gh: ['gh', 'general hardness'],
  conductivity: ['conductivity', 'ec', 'us/cm'],
  oxygen: ['oxygen', 'do', 'o2', 'dissolved oxygen'],
  salinity: ['salinity', 'psu', 'sal'],
  specific_gravity: ['specific gravity', 'sg'],
  calcium: ['calcium', 'ca'],
  magnesium: ['magnesium'],
  phosphate: ['phosphate', 'po4'],
  copper: ['copper', 'cu'],
}

/** A metric and unit guessed from a header such as "Water temp (°F)" or "temp_f". */
export function guessMetric(header: string): { metric: MetricKey; unit: string } | null {
  const text = normalise(header.replace(/°/g, ' deg '))
  const words = text.split(' ')
  for (const metric of METRIC_KEYS) {
    const hit = METRIC_WORDS[metric].some((w) => (w.includes(' ') ? text.includes(w) : words.includes(w)))
    if (!hit) continue
    const def = METRICS[metric]
    let unit = def.unit
    if (metric === 'temperature' && /\bdeg f\b|\bf\b|fahrenheit/.test(text)) unit = 'F'
    // An ammonium kit's column is total ammonia written as NH4+, never NH3.
    else if (metric === 'ammonia' && (words.includes('nh4') || words.includes('ammonium'))) unit = 'mg/L NH4'
    else {
      for (const code of Object.keys(def.units)) {
        if (code !== def.unit && words.includes(normalise(code))) unit = code
      }
    }
    return { metric, unit }
  }
  return null
}

const TIME_HEADER = /^(time|timestamp|date|datetime|date time|date and time|when|measured at|recorded|zeit|datum)$/

/** The preview of an uploaded file: delimiter, header, first rows, time column and format, a suggested mapping. */
export function buildPreview(
  text: string,
  complete: boolean,
  options: { timeZone: string; siteImport: boolean; remembered?: ImportMapping | null },
): ImportPreview {
  const body = completeLines(text, complete)
  const delimiter = detectDelimiter(body)
  // Lines whose quoting cannot be read are left out here; the import refuses each on its own line.
  const records = recordsOf(body, delimiter, 200)
  const first = records[0]
  if (first && 'error' in first) throw new UnreadableHeaderError(first.line, first.error)
  const rows = records.flatMap((r) => ('fields' in r ? [r.fields] : []))
  const header = rows[0] ?? []
  if (header.length < 2) throw new NotCsvError('The file needs a header row and at least two columns (a time and a value)')
  const data = rows.slice(1)
  const column = (i: number) => data.map((r) => r[i] ?? '').filter(Boolean)

  let timeIndex = header.findIndex((h) => TIME_HEADER.test(normalise(h)))
  if (timeIndex < 0)
    timeIndex = header.findIndex((_, i) => column(i).length > 0 && column(i).slice(0, 20).filter(looksLikeTime).length > column(i).slice(0, 20).length / 2)
  const timeColumn = timeIndex >= 0 ? header[timeIndex]! : null
  const time = timeIndex >= 0 ? detectTimeFormat(column(timeIndex).slice(0, 50), options.timeZone) : null

  const fits = options.remembered && [options.remembered.timeColumn, ...options.remembered.metrics.map((m) => m.column)].every((c) => header.includes(c))
  if (fits && options.remembered) {
    return { delimiter, header, rows: data.slice(0, PREVIEW_ROWS), timeColumn, time, suggested: options.remembered, suggestedFrom: 'source' }
  }

  const tankIndex = options.siteImport ? header.findIndex((h) => /^(tank|tank name|aquarium|system)$/.test(normalise(h))) : -1
  const metrics = header
    .map((h, i) => ({ h, i, guess: i === timeIndex || i === tankIndex ? null : guessMetric(h) }))
    .filter((c) => c.guess)
    .map((c) => ({ column: c.h, metric: c.guess!.metric, unit: c.guess!.unit }))
  const suggested: ImportPreview['suggested'] = {
    metrics,
    ...(timeColumn ? { timeColumn } : {}),
    ...(time ? { timeFormat: time.candidates[0]! } : {}),
    ...(time?.needsZone ? { timeZone: options.timeZone } : {}),
    ...(tankIndex >= 0 ? { tankColumn: header[tankIndex]! } : {}),
  }
  return { delimiter, header, rows: data.slice(0, PREVIEW_ROWS), timeColumn, time, suggested, suggestedFrom: 'headers' }
}
