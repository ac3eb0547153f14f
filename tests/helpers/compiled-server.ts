// Suites that run the app as its own process use it compiled, as `npm start` does: a start then
// takes a second or two instead of tsx compiling the whole server again for every process.
import { join } from 'node:path'
// @ts-expect-error a plain ES module of the project's scripts, without type declarations
import { buildServer } from '../../scripts/lib/build-server.mjs'

const ROOT = join(import.meta.dirname, '..', '..')
const built = new Map<string, Promise<string>>()

/** The entry file compiled to one module under .build/ (once per test process); answers its path. */
export function compiledEntry(entry: string): Promise<string> {
  const relative = entry.startsWith(ROOT) ? entry.slice(ROOT.length + 1) : entry
  let module = built.get(relative)
  if (!module) {
    module = buildServer(ROOT, relative, `.build/test-${relative.replace(/[^\w]+/g, '-')}.mjs`) as Promise<string>
    built.set(relative, module)
  }
  return module
}
