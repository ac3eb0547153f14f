// Reads the text back out of an uncompressed pdfkit PDF (compress: false), for assertions.
// pdfkit writes embedded-font text as glyph ids and a ToUnicode CMap per font; this maps them back.

type PdfObjects = Map<number, string>

function objects(pdf: string): PdfObjects {
  const map: PdfObjects = new Map()
  for (const m of pdf.matchAll(/(\d+) 0 obj([\s\S]*?)endobj/g)) map.set(Number(m[1]), m[2]!)
  return map
}

const hexToText = (hex: string) => {
  let out = ''
  for (let i = 0; i + 4 <= hex.length; i += 4) out += String.fromCodePoint(parseInt(hex.slice(i, i + 4), 16))
  return out
}

/** ToUnicode maps: glyph id (4 hex digits) → text, for the `bfrange` arrays and `bfchar` lines pdfkit writes. */
function cmapOf(stream: string): Map<string, string> {
  const map = new Map<string, string>()
  for (const m of stream.matchAll(/<([0-9a-f]{4})>\s*<([0-9a-f]{4})>\s*\[([^\]]*)\]/gi)) {
    const start = parseInt(m[1]!, 16)
    const targets = [...m[3]!.matchAll(/<([0-9a-f ]+)>/gi)].map((t) => hexToText(t[1]!.replace(/ /g, '')))
    targets.forEach((text, i) => map.set((start + i).toString(16).padStart(4, '0'), text))
  }
  for (const m of stream.matchAll(/^<([0-9a-f]{4})>\s*<([0-9a-f]+)>\s*$/gim)) map.set(m[1]!.toLowerCase(), hexToText(m[2]!))
  return map
}

/** The text of every page, one string per BT…ET block, in drawing order. */
export function pdfText(buffer: Buffer): string[] {
  const pdf = buffer.toString('latin1')
  const objs = objects(pdf)
  const fonts = new Map<string, Map<string, string>>()
  for (const body of objs.values()) {
    const dict = /\/Font\s*<<([^>]*)>>/.exec(body)
    if (!dict) continue
    for (const ref of dict[1]!.matchAll(/\/(\w+)\s+(\d+) 0 R/g)) {
      const font = objs.get(Number(ref[2]))
      const toUnicode = font && /\/ToUnicode (\d+) 0 R/.exec(font)
      if (toUnicode) fonts.set(ref[1]!, cmapOf(objs.get(Number(toUnicode[1])) ?? ''))
    }
  }
  const blocks: string[] = []
  for (const body of objs.values()) {
    if (!/\bTf\b/.test(body) || !/stream/.test(body)) continue
    let cmap: Map<string, string> | undefined
    let current = ''
    for (const m of body.matchAll(/\/(\w+) [\d.]+ Tf|\[([^\]]*)\] TJ|\bET\b/g)) {
      if (m[1]) cmap = fonts.get(m[1])
      else if (m[2] !== undefined) {
        for (const h of m[2].matchAll(/<([0-9a-f]+)>/gi)) {
          for (let i = 0; i + 4 <= h[1]!.length; i += 4) current += cmap?.get(h[1]!.slice(i, i + 4).toLowerCase()) ?? '?'
        }
      } else {
        blocks.push(current)
        current = ''
      }
    }
  }
  return blocks
}

/** How many pages the document has (its page objects). */
export const pdfPageCount = (buffer: Buffer) => (buffer.toString('latin1').match(/\/Type \/Page\b(?!s)/g) ?? []).length
