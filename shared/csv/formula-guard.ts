// A spreadsheet opened from an exported CSV runs any cell that starts like a formula. Every text
// cell the app writes into a CSV goes through this first, so a tank named "=HYPERLINK(…)" stays text.

const FORMULA_START = /^[=+\-@\t\r]/

/**
 * Prefixes a single quote to a text cell that a spreadsheet would read as a formula.
 * Numbers are left alone: a negative temperature is data, not a formula.
 */
export function neutraliseFormula(cell: string): string {
  if (!FORMULA_START.test(cell)) return cell
  if (/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(cell)) return cell
  return `'${cell}`
}

/** A whole CSV row: strings guarded, numbers, booleans and null written as they are. */
export function guardRow(row: ReadonlyArray<string | number | boolean | null | undefined>): Array<string | number | boolean | null | undefined> {
  return row.map((cell) => (typeof cell === 'string' ? neutraliseFormula(cell) : cell))
}
