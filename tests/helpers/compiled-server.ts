// Suites that run the app as its own process use it compiled, as `npm start` does: a start then
// takes a second or two instead of tsx compiling the whole server again for every process.
import { join } from 'node:path'
// @ts-expect-error a plain ES module of the project's scripts, without type declarations
import { buildServer } from '../../scripts/lib/build-server.mjs'

const ROOT = join(import.meta.dirname, '..', '..')
/** Every entry the suites start as a process of its own. */
const ENTRIES = ['server/index.ts', 'tests/stress/multi-instance-entry.ts']
const built = new Map<string, Promise<string>>()
const outfileOf = (relative: string) => `.build/test-${relative.replace(/[^\w]+/g, '-')}.mjs`

/**
 * Compiles every entry once for the whole run (the global setup calls it, before any file starts),
 * and names them in TW_COMPILED_ENTRIES for the test files: files running side by side then never
 * rewrite a module another one is starting.
 */
export async function compileEntries() {
  await Promise.all(ENTRIES.map((entry) => buildServer(ROOT, entry, outfileOf(entry))))
  process.env.TW_COMPILED_ENTRIES = ENTRIES.join(',')
}

/** The entry file compiled to one module under .build/ (by the global setup, else once per test process); answers its path. */
export function compiledEntry(entry: string): Promise<string> {
  const relative = entry.startsWith(ROOT) ? entry.slice(ROOT.length + 1) : entry
  if (process.env.TW_COMPILED_ENTRIES?.split(',').includes(relative)) return Promise.resolve(join(ROOT, outfileOf(relative)))
  let module = built.get(relative)
  if (!module) {
    module = buildServer(ROOT, relative, outfileOf(relative)) as Promise<string>
    built.set(relative, module)
  }
  return module
}
