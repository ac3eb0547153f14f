import fc from 'fast-check'
import { EDGE_TIMES } from './fuzz-values'

/** One hostile upload: the bytes, their Content-Type, and how they were made (for the report). */
export type FuzzUpload = { contentType: string; body: Buffer; how: string }

const BOUNDARY = 'fuzzBoundary7MA4YWxkTrZu0gW'

/** A well-formed multipart body with one file part. */
export function multipart(
  field: string,
  fileName: string,
  content: Buffer,
  boundary = BOUNDARY,
  disposition = `form-data; name="${field}"; filename="${fileName}"`,
) {
  return Buffer.concat([
    Buffer.from(`--${boundary}\r\nContent-Disposition: ${disposition}\r\nContent-Type: text/csv\r\n\r\n`, 'latin1'),
    content,
    Buffer.from(`\r\n--${boundary}--\r\n`, 'latin1'),
  ])
}

const CONTROL = fc.integer({ min: 0, max: 31 }).map((code) => String.fromCharCode(code))

/**
 * A multipart body broken one way: truncated anywhere, no or a wrong boundary, control characters
 * in the file name (raw and percent-encoded), no disposition, two files, garbage before the first
 * boundary, a part header without its blank line, a header of 20 kB.
 */
export function hostileMultipart(field: string, content: Buffer): fc.Arbitrary<FuzzUpload> {
  const whole = multipart(field, 'readings.csv', content)
  const type = `multipart/form-data; boundary=${BOUNDARY}`
  return fc.oneof(
    fc
      .integer({ min: 0, max: whole.length - 1 })
      .map((cut) => ({ contentType: type, body: whole.subarray(0, cut), how: `truncated at ${cut}/${whole.length}` })),
    fc.constant({ contentType: 'multipart/form-data', body: whole, how: 'no boundary' }),
    fc.constant({ contentType: 'multipart/form-data; boundary=', body: whole, how: 'empty boundary' }),
    fc.constant({ contentType: 'multipart/form-data; boundary=somethingElse', body: whole, how: 'wrong boundary' }),
    CONTROL.map((c) => ({
      contentType: type,
      body: multipart(field, `read${c}ings.csv`, content),
      how: `control 0x${c.charCodeAt(0).toString(16)} in the file name`,
    })),
    CONTROL.map((c) => ({
      contentType: type,
      body: multipart(field, '', content, BOUNDARY, `form-data; name="${field}"; filename*=utf-8''read${encodeURIComponent(c)}ings.csv`),
      how: `encoded control 0x${c.charCodeAt(0).toString(16)} in the file name`,
    })),
    fc.constant({ contentType: type, body: multipart(field, '', content, BOUNDARY, 'inline'), how: 'no form-data disposition' }),
    fc.constant({
      contentType: type,
      body: Buffer.concat([multipart(field, 'a.csv', content).subarray(0, -4), Buffer.from('\r\n'), multipart(field, 'b.csv', content)]),
      how: 'two files',
    }),
    fc
      .uint8Array({ minLength: 1, maxLength: 200 })
      .map((junk) => ({ contentType: type, body: Buffer.concat([Buffer.from(junk), whole]), how: 'bytes before the first boundary' })),
    fc.constant({
      contentType: type,
      body: Buffer.from(whole.toString('latin1').replace('text/csv\r\n\r\n', 'text/csv\r\n'), 'latin1'),
      how: 'no blank line after the part header',
    }),
    fc.constant({ contentType: type, body: multipart(field, 'x'.repeat(20_000), content), how: 'a 20 kB file name' }),
    fc.uint8Array({ maxLength: 400 }).map((bytes) => ({ contentType: type, body: Buffer.from(bytes), how: 'random bytes' })),
  )
}

const quoteBreakers = ['"', '"x"y', '""', '"\n', '\r', '\u0000', '\ufeff', ';', '\t', '|', ',,,,', '"a""b"', '" spaced "', 'x"y', '\\"', '\u2028']

/** Lines of CSV around a valid file: badly quoted fields, stray quotes, odd line ends, edge dates, long lines. */
export function hostileCsv(times: string[]): fc.Arbitrary<{ text: Buffer; how: string }> {
  const lines = ['time,temperature', ...times.map((time, i) => `${time},${(24 + (i % 10) / 10).toFixed(1)}`)]
  type Edit = { at: number; kind: string; value: string }
  const edit: fc.Arbitrary<Edit> = fc.record({
    at: fc.integer({ min: 0, max: lines.length - 1 }),
    kind: fc.constantFrom('prefix', 'suffix', 'replace line', 'replace time', 'insert line', 'long line'),
    value: fc.oneof(
      fc.constantFrom(...quoteBreakers),
      fc.constantFrom(...EDGE_TIMES),
      fc.string({ maxLength: 30 }),
      fc.string({ unit: 'binary', maxLength: 20 }),
    ),
  })
  return fc.tuple(fc.array(edit, { minLength: 1, maxLength: 4 }), fc.constantFrom('\n', '\r\n', '\r')).map(([edits, eol]) => {
    const out = [...lines]
    for (const e of edits) {
      const line = out[e.at] ?? ''
      if (e.kind === 'prefix') out[e.at] = e.value + line
      else if (e.kind === 'suffix') out[e.at] = line + e.value
      else if (e.kind === 'replace line') out[e.at] = e.value
      else if (e.kind === 'replace time') out[e.at] = `${e.value},25.0`
      else if (e.kind === 'insert line') out.splice(e.at, 0, e.value)
      else out[e.at] = `${line},"${'z'.repeat(100_000)}`
    }
    const how = edits.map((e) => `${e.kind} ${e.at} ${JSON.stringify(e.value.slice(0, 40))}`).join('; ') + ` eol ${JSON.stringify(eol)}`
    return { text: Buffer.from(out.join(eol) + eol, 'utf8'), how }
  })
}
