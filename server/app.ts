import { resolve } from 'node:path'
import express from 'express'
import helmet from 'helmet'
import type { AppContext } from './context'
import { serveClientPages } from './platform/http/client-pages'
import { errorHandler, notFoundHandler } from './platform/http/errors'
import { MAX_PAYLOAD_BYTES } from '@shared/ingest/contract'
import { apiRouter } from './api-router'
import { requestLogger } from './platform/http/request-log'

export const JSON_BODY_LIMIT = '1mb'

/** Builds the Express app without listening, so tests can drive it with supertest. */
export function createApp(ctx: AppContext, options: { clientDir?: string } = {}) {
  const app = express()
  app.disable('x-powered-by')
  // X-Forwarded-For names the client only when it comes from a configured proxy (TRUST_PROXY).
  app.set('trust proxy', ctx.config.trustProxy)
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Vuetify and ECharts set inline styles; scripts stay same-origin only.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          // The live socket is on this same origin; no other host may be reached from the page.
          'connect-src': ["'self'", (req) => sameOriginSockets(req.headers.host)],
          'upgrade-insecure-requests': null,
        },
      },
    }),
  )
  if (ctx.config.logLevel !== 'silent') {
    app.use(requestLogger(ctx.logger))
  }
  // Private data: no shared or browser cache keeps an API answer unless its route says otherwise (photos).
  app.use('/api', (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store')
    next()
  })
  // Device batches have their own, documented size limit; everything else the general one.
  app.use('/api/v1/readings', express.json({ limit: MAX_PAYLOAD_BYTES }))
  app.use('/api/v1', express.json({ limit: JSON_BODY_LIMIT }), apiRouter(ctx))
  app.use('/api', notFoundHandler)

  if (ctx.config.serveClient) serveClientPages(app, options.clientDir ?? resolve('dist'))
  app.use(notFoundHandler)
  app.use(errorHandler(ctx.logger))
  return app
}

/** `ws:` and `wss:` to the host the page came from; nothing when the Host header is not a plain host[:port]. */
function sameOriginSockets(host: string | undefined): string {
  if (!host || !/^[A-Za-z0-9.-]+(:\d{1,5})?$|^\[[0-9A-Fa-f:.]+\](:\d{1,5})?$/.test(host)) return ''
  return `ws://${host} wss://${host}`
}
