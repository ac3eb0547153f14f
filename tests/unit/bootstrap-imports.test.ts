import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join, relative, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'

// `npm start`, `npm test`, `npm run bench` and `npm run smoke` run scripts/ before `npm ci` has
// installed anything: a static import of a package there fails on a fresh clone before the install
// step can run. Packages are loaded with a dynamic import() after the install.
const root = resolve(__dirname, '../..')

/** The specifiers of a module's static imports and re-exports (dynamic import() is not one). */
function staticImports(source: string): string[] {
  const code = source.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '')
  const found: string[] = []
  const patterns = [/^\s*(?:import|export)\s[^'"()]*?\bfrom\s*['"]([^'"]+)['"]/gm, /^\s*import\s*['"]([^'"]+)['"]/gm]
  for (const pattern of patterns) for (const match of code.matchAll(pattern)) found.push(match[1])
  return found
}

function filesUnder(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name)
    return statSync(path).isDirectory() ? filesUnder(path) : /\.(mjs|js)$/.test(name) ? [path] : []
  })
}

/** Every static import reachable from `entries` that is neither a Node built-in nor a relative file. */
function forbiddenImports(entries: string[]): string[] {
  const seen = new Set<string>()
  const bad: string[] = []
  const visit = (file: string) => {
    if (seen.has(file)) return
    seen.add(file)
    for (const spec of staticImports(readFileSync(file, 'utf8'))) {
      if (spec.startsWith('node:')) continue
      if (spec.startsWith('./') || spec.startsWith('../')) visit(resolve(dirname(file), spec))
      else bad.push(`${relative(root, file)} imports '${spec}'`)
    }
  }
  entries.forEach(visit)
  return bad
}

describe('what runs before the install step', () => {
  it('reads static imports, re-exports and bare imports, not dynamic ones', () => {
    const source = [
      "import { a } from 'node:fs'",
      "import {\n  b,\n  c,\n} from './lib/x.mjs'",
      "import * as d from 'pkg-one'",
      "export { e } from 'pkg-two'",
      "import 'pkg-three'",
      "const f = await import('pkg-dynamic')",
      "// import { g } from 'pkg-commented'",
    ].join('\n')
    expect(staticImports(source).sort()).toEqual(['./lib/x.mjs', 'node:fs', 'pkg-one', 'pkg-three', 'pkg-two'])
  })

  it('finds a package imported by a relative file further down', () => {
    const dir = mkdtempSync(join(tmpdir(), 'tw-imports-'))
    try {
      writeFileSync(join(dir, 'entry.mjs'), "import { spawn } from 'node:child_process'\nimport { build } from './lib.mjs'\n")
      writeFileSync(join(dir, 'lib.mjs'), "import { build } from 'esbuild'\nexport { build }\n")
      expect(forbiddenImports([join(dir, 'entry.mjs')]).map((line) => line.replace(relative(root, dir), 'DIR'))).toEqual(["DIR/lib.mjs imports 'esbuild'"])
    } finally {
      rmSync(dir, { recursive: true, force: true })
    }
  })

  it('scripts/ imports only Node built-ins and relative files that obey the same rule', () => {
    expect(forbiddenImports(filesUnder(join(root, 'scripts')))).toEqual([])
  })

  it('every npm script that bootstraps runs a file in scripts/', () => {
    const { scripts } = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8')) as { scripts: Record<string, string> }
    for (const name of ['start', 'test', 'bench', 'smoke']) expect(scripts[name]).toMatch(/^node scripts\/[\w-]+\.mjs\b/)
  })
})
