import { describe, expect, it } from 'vitest'
import { MAX_RECORD_LINES, QUOTE_NOT_CLOSED, recordsOf, splitRecord } from '../../../server/imports/csv-records'

// Quoting as RFC 4180 (Shafranovich, 2005), section 2, with quotes inside unquoted fields kept as text.
describe('splitRecord', () => {
  it.each([
    ['a,b,c', ',', ['a', 'b', 'c']],
    [' a , b ', ',', ['a', 'b']],
    ['"a,b",c', ',', ['a,b', 'c']],
    ['"say ""hi""",2', ',', ['say "hi"', '2']],
    ['25",x"y', ',', ['25"', 'x"y']],
    ['a,', ',', ['a', '']],
    ['"a",', ',', ['a', '']],
    ['24,5;7', ';', ['24,5', '7']],
    ['a\t b', '\t', ['a', 'b']],
    ['', ',', ['']],
  ])('%j with %j', (text, delimiter, fields) => expect(splitRecord(text, delimiter)).toEqual({ fields }))

  it('refuses text after a closing quote, naming the column, and an unclosed quote', () => {
    expect(splitRecord('t,"x"y', ',')).toEqual({ error: expect.stringMatching(/^column 2: unexpected text after the closing quote/), open: false })
    expect(splitRecord('"t,25', ',')).toEqual({ error: QUOTE_NOT_CLOSED, open: true })
  })
})

describe('recordsOf', () => {
  it('refuses each bad line once and reads on from the next line', () => {
    const text = 'time,temp\n1,"x"y\n2,25\n"3,26\n4,27\n'
    expect(recordsOf(text, ',')).toEqual([
      { line: 1, fields: ['time', 'temp'] },
      { line: 2, error: expect.stringMatching(/unexpected text/), text: '1,"x"y' },
      { line: 3, fields: ['2', '25'] },
      { line: 4, error: QUOTE_NOT_CLOSED, text: '"3,26' },
      { line: 5, fields: ['4', '27'] },
    ])
  })

  it('keeps a quoted field over several lines, with the number of its first line', () => {
    expect(recordsOf('note,v\r\n"two\r\nlines",1\r\n\r\nx,2', ',')).toEqual([
      { line: 1, fields: ['note', 'v'] },
      { line: 2, fields: ['two\nlines', '1'] },
      { line: 5, fields: ['x', '2'] },
    ])
  })

  it(`gives up on a quote still open after ${MAX_RECORD_LINES} lines and reads those lines afresh`, () => {
    const lines = ['"open', ...Array.from({ length: MAX_RECORD_LINES + 2 }, (_, i) => `${i},1`)]
    const records = recordsOf(lines.join('\n'), ',')
    expect(records[0]).toEqual({ line: 1, error: QUOTE_NOT_CLOSED, text: '"open' })
    expect(records.slice(1).map((r) => r.line)).toEqual(lines.slice(1).map((_, i) => i + 2))
  })

  it('strips a byte-order mark from the first line', () => {
    expect(recordsOf('\ufefftime,temp\n', ',')).toEqual([{ line: 1, fields: ['time', 'temp'] }])
  })
})
