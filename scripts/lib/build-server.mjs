// The server as one ES module of our own code (packages stay in node_modules), run with plain node.
// Compiling once instead of through the tsx loader at run time spares the loader's worker thread and
// its source maps: about 60 MB of the app's memory on this machine kind (see the README's figures).
// esbuild is loaded on use, not at import: `npm start` imports this file before it installs packages.
import { join } from 'node:path'

export async function buildServer(root, entry = 'server/index.ts', outfile = '.build/server.mjs') {
  const out = join(root, outfile)
  const { build } = await import('esbuild')
  await build({
    absWorkingDir: root,
    entryPoints: [entry],
    outfile: out,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    logLevel: 'warning',
  })
  return out
}

/**
 * V8 settings the server runs with (`npm start`, the bench). Left to itself V8 sizes the heap from
 * the machine's memory and lets garbage pile up to hundreds of MB under steady ingest before it
 * collects; a young generation of 8 MB per semi-space keeps short-lived message garbage cheap to
 * collect, and an old-space ceiling makes the collector work before the heap grows far past what is
 * alive (a thousand tanks keep about 60 MB alive). The ceiling is a limit, not a reservation:
 * raise it with NODE_HEAP_MB for a much larger shop.
 */
export function serverNodeFlags(env = process.env) {
  const heapMb = Number(env.NODE_HEAP_MB) || 512
  return [`--max-semi-space-size=8`, `--max-old-space-size=${heapMb}`]
}
