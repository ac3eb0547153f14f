/**
 * CSV records read line by line, so one badly quoted line is refused on its own (once, naming its
 * line) instead of swallowing the rest of the file. RFC 4180 quoting, with two allowances that
 * files from loggers and spreadsheets need: a quote inside an unquoted field is text (`25"`), and
 * spaces around fields are trimmed. A quoted field may run over several lines (a note with a line
 * break), up to MAX_RECORD_LINES; a quote still open after that, or at the end of the file, refuses
 * the line that opened it and reading goes on from the next line.
 */
export const MAX_RECORD_LINES = 20
const MAX_RECORD_CHARS = 64 * 1024

export const QUOTE_NOT_CLOSED = 'a quoted field opened on this line is never closed'

export type CsvLine = { number: number; text: string }
export type CsvRecord = { line: number; fields: string[] } | { line: number; error: string; text: string }

type Split = { fields: string[] } | { error: string; open: boolean }

function isBlank(char: string | undefined, delimiter: string) {
  return (char === ' ' || char === '\t') && char !== delimiter
}

/** One record's text into its fields, or why its quoting cannot be read. */
export function splitRecord(text: string, delimiter: string): Split {
  const fields: string[] = []
  let i = 0
  for (;;) {
    while (isBlank(text[i], delimiter)) i++
    if (text[i] === '"') {
      let value = ''
      let from = i + 1
      for (;;) {
        const quote = text.indexOf('"', from)
        if (quote < 0) return { error: QUOTE_NOT_CLOSED, open: true }
        value += text.slice(from, quote)
        if (text[quote + 1] === '"') {
          value += '"'
          from = quote + 2
          continue
        }
        i = quote + 1
        break
      }
      while (isBlank(text[i], delimiter)) i++
      fields.push(value)
      if (i >= text.length) return { fields }
      if (!text.startsWith(delimiter, i)) {
        return { error: `column ${fields.length}: unexpected text after the closing quote (write a quote inside a quoted field as "")`, open: false }
      }
      i += delimiter.length
      if (i >= text.length) return { fields: [...fields, ''] }
      continue
    }
    const end = text.indexOf(delimiter, i)
    if (end < 0) {
      fields.push(text.slice(i).trim())
      return { fields }
    }
    fields.push(text.slice(i, end).trim())
    i = end + delimiter.length
    if (i >= text.length) return { fields: [...fields, ''] }
  }
}

/** Physical lines in (numbered from 1), records out; blank lines are skipped. */
export class CsvRecordReader {
  private held: CsvLine[] = []

  constructor(private readonly delimiter: string) {}

  push(line: CsvLine): CsvRecord[] {
    const out: CsvRecord[] = []
    this.take(line, out)
    return out
  }

  /** At the end of the file: a quote still open refuses its line; the lines after it are read again. */
  end(): CsvRecord[] {
    const out: CsvRecord[] = []
    while (this.held.length) this.refuseFirst(QUOTE_NOT_CLOSED, out)
    return out
  }

  private take(line: CsvLine, out: CsvRecord[]) {
    if (!this.held.length && !line.text.trim()) return
    this.held.push(line)
    const text = this.held.length === 1 ? line.text : this.held.map((l) => l.text).join('\n')
    const result = splitRecord(text, this.delimiter)
    if ('fields' in result) {
      out.push({ line: this.held[0]!.number, fields: result.fields })
      this.held = []
    } else if (!result.open || this.held.length >= MAX_RECORD_LINES || text.length >= MAX_RECORD_CHARS) {
      this.refuseFirst(this.held.length === 1 ? result.error : QUOTE_NOT_CLOSED, out)
    }
  }

  private refuseFirst(error: string, out: CsvRecord[]) {
    const [first, ...rest] = this.held
    this.held = []
    if (!first) return
    out.push({ line: first.number, error, text: first.text })
    for (const line of rest) this.take(line, out)
  }
}

/** The records of a whole text (the preview's head of a file). */
export function recordsOf(text: string, delimiter: string, limit = Infinity): CsvRecord[] {
  const reader = new CsvRecordReader(delimiter)
  const records: CsvRecord[] = []
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/)
  for (let i = 0; i < lines.length && records.length < limit; i++) records.push(...reader.push({ number: i + 1, text: lines[i]! }))
  if (records.length < limit) records.push(...reader.end())
  return records.slice(0, limit)
}
