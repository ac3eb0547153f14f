import { describe, expect, it } from 'vitest'
import { guardRow, neutraliseFormula } from '@shared/csv/formula-guard'

// The leading characters and the quote prefix follow the OWASP "CSV Injection" page (OWASP
// Foundation, 2023): cells beginning with =, +, -, @, tab or carriage return are escaped with '.
describe('CSV formula guard', () => {
  it.each(['=1+1', '+SUM(A1)', '-2+3', '@cmd', '\t=1', '\r=1', '=HYPERLINK("http://x","y")'])('neutralises %j', (cell) => {
    expect(neutraliseFormula(cell)).toBe(`'${cell}`)
  })
  it.each(['Sales row A1', '', '25.4', '-1.5', '+7', '-3e2', 'a=b'])('leaves %j as it is', (cell) => {
    expect(neutraliseFormula(cell)).toBe(cell)
  })
  it('guards only the text cells of a row', () => {
    expect(guardRow(['=x', -1, null, true, 'ok'])).toEqual(["'=x", -1, null, true, 'ok'])
  })
})
