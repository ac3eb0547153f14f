import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    return statSync(path).isDirectory() ? files(path) : [path]
  })
}

describe('the built client', () => {
  it('loads nothing from outside the machine: no http(s) URL in any built HTML, CSS or JS resource reference', () => {
    const built = files('dist').filter((f) => /\.(html|css|js)$/.test(f))
    expect(built.length).toBeGreaterThan(3)
    const offenders: string[] = []
    for (const file of built) {
      const text = readFileSync(file, 'utf8')
      // Resource references: url(...), src=, href=, import("..."), @import. Plain strings in code
      // (licence comments, XML namespaces) are not fetched and are left alone.
      const refs = [
        ...text.matchAll(/url\(\s*['"]?(https?:)?\/\/[^)'"]+/g),
        ...text.matchAll(/(?:src|href)\s*=\s*['"](https?:)?\/\/[^'"]+/g),
        ...text.matchAll(/@import\s+['"](https?:)?\/\/[^'"]+/g),
        ...text.matchAll(/import\(\s*['"]https?:\/\/[^'"]+/g),
      ].map((m) => m[0])
      for (const ref of refs) if (!/www\.w3\.org/.test(ref)) offenders.push(`${file}: ${ref}`)
    }
    expect(offenders).toEqual([])
  })

  it('ships the fonts as woff2 only, no icon font, and a brotli and gzip copy of each larger script and style', () => {
    const assets = files('dist').map((f) => f.toLowerCase())
    expect(assets.some((f) => /roboto-mono.*\.woff2$/.test(f))).toBe(true)
    expect(assets.some((f) => /roboto-latin.*\.woff2$/.test(f))).toBe(true)
    // Icons are SVG paths in the scripts (tooling/vite-mdi-icons.ts); fonts need nothing older than woff2.
    expect(assets.filter((f) => /materialdesignicons|\.(woff|ttf|eot)$/.test(f))).toEqual([])
    const texts = files('dist').filter((f) => /\.(js|css)$/.test(f) && statSync(f).size > 1024)
    expect(texts.length).toBeGreaterThan(10)
    expect(texts.filter((f) => !assets.includes(`${f}.br`.toLowerCase()) || !assets.includes(`${f}.gz`.toLowerCase()))).toEqual([])
  })
})
