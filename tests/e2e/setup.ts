import { existsSync, readFileSync } from 'node:fs'

// `npm test` builds the client beside vitest and names a file it writes when the build ends
// (CLIENT_BUILD_DONE); the browser tests serve `dist`, so each file waits for it here. Without the
// variable (one file run on its own) the `dist` already on disk is used.
const marker = process.env.CLIENT_BUILD_DONE
if (marker) {
  const deadline = Date.now() + 10 * 60_000
  while (!existsSync(marker)) {
    if (Date.now() > deadline) throw new Error(`the client build did not finish within 10 min (${marker} was not written)`)
    await new Promise((r) => setTimeout(r, 500))
  }
  const { ok } = JSON.parse(readFileSync(marker, 'utf8')) as { ok: boolean }
  if (!ok) throw new Error('the client build failed (see "client build (vite)" at the end of the output): the browser tests need dist/')
}
