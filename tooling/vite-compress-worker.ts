import { existsSync, readFileSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { brotliCompressSync, constants, gzipSync } from 'node:zlib'
import type { Plugin } from 'vite'

/**
 * The service worker is written after the bundle (vite-plugin-pwa, at the close of the build), so
 * the compression plugin never sees it: this writes its brotli and gzip copies, as for every other script.
 */
export function compressServiceWorker(options: { outDir: string; file: string }): Plugin {
  return {
    name: 'tankwarden:compress-service-worker',
    apply: 'build',
    closeBundle: {
      order: 'post',
      sequential: true,
      handler() {
        const path = join(options.outDir, options.file)
        if (!existsSync(path)) return
        const source = readFileSync(path)
        writeFileSync(`${path}.br`, brotliCompressSync(source, { params: { [constants.BROTLI_PARAM_QUALITY]: 11 } }))
        writeFileSync(`${path}.gz`, gzipSync(source, { level: 9 }))
      },
    },
  }
}
