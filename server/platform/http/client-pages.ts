import { existsSync } from 'node:fs'
import type { ServerResponse } from 'node:http'
import { join } from 'node:path'
import type { Express, RequestHandler } from 'express'
import expressStaticGzip from 'express-static-gzip'

/**
 * Serves the built client from `dist`: its files, and index.html for every client-side route, the
 * root included. A path that names a file (it has an extension) and is not there stays a 404, so
 * /favicon.ico or a stale chunk never answers with the page. The build writes a brotli and a gzip
 * copy beside each text file (vite.config.ts); a browser gets the one it accepts, brotli first.
 */
export function serveClientPages(app: Express, dist: string): void {
  if (!existsSync(join(dist, 'index.html'))) return
  app.use(precompressedFiles(dist))
  app.get(['/', '/*splat'], (req, res, next) => {
    if (/\.[^/]*$/.test(req.path)) return next()
    res.sendFile(join(dist, 'index.html'))
  })
}

// The service worker, the manifest and the icons keep their names from one version to the next: a
// browser asks again each time, so a new version is found at the next visit, not an hour later.
const UNHASHED = /\/(sw\.js|manifest\.webmanifest|[\w-]+\.(png|ico|svg))(\.br|\.gz)?$/

function revalidateUnhashed(res: ServerResponse, path: string) {
  if (UNHASHED.test(path) && !path.includes('/assets/')) res.setHeader('Cache-Control', 'no-cache')
}

function precompressedFiles(dist: string): RequestHandler {
  const serve = expressStaticGzip(dist, {
    enableBrotli: true,
    orderPreference: ['br', 'gzip'],
    index: false,
    serveStatic: { maxAge: '1h', setHeaders: revalidateUnhashed },
  })
  return (req, res, next) => {
    // A path that does not decode is no file of ours; the router answers it with the usual JSON error.
    try {
      decodeURIComponent(req.path)
    } catch {
      return next()
    }
    return serve(req, res, next)
  }
}
