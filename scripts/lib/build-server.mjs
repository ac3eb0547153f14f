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
