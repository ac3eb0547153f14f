import { existsSync } from 'node:fs'
import { join } from 'node:path'
import express, { type Express } from 'express'

/**
 * Serves the built client from `dist`: its files, and index.html for every client-side route, the
 * root included. A path that names a file (it has an extension) and is not there stays a 404, so
 * /favicon.ico or a stale chunk never answers with the page.
 */
export function serveClientPages(app: Express, dist: string): void {
  if (!existsSync(join(dist, 'index.html'))) return
  app.use(express.static(dist, { index: false, maxAge: '1h' }))
  app.get(['/', '/*splat'], (req, res, next) => {
    if (/\.[^/]*$/.test(req.path)) return next()
    res.sendFile(join(dist, 'index.html'))
  })
}
