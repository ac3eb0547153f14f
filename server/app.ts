import { resolve } from 'node:path'
import express from 'express'
import helmet from 'helmet'
import { pinoHttp } from 'pino-http'
import type { AppContext } from './context'
import { serveClientPages } from './http/client-pages'
import { errorHandler, notFoundHandler } from './http/errors'
import { MAX_PAYLOAD_BYTES } from '@shared/ingest/contract'
import { apiRouter } from './routes'

export const JSON_BODY_LIMIT = '1mb'

/** Builds the Express app without listening, so tests can drive it with supertest. */
export function createApp(ctx: AppContext, options: { clientDir?: string } = {}) {
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // Vuetify and ECharts set inline styles; scripts stay same-origin only.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'connect-src': ["'self'", 'ws:', 'wss:'],
          'upgrade-insecure-requests': null,
        },
      },
    }),
  )
  if (ctx.config.logLevel !== 'silent') {
    app.use(pinoHttp({ logger: ctx.logger, autoLogging: { ignore: (req) => req.url === '/api/v1/health' } }))
  }
  // Device batches have their own, documented size limit; everything else the general one.
  app.use('/api/v1/readings', express.json({ limit: MAX_PAYLOAD_BYTES }))
  app.use('/api/v1', express.json({ limit: JSON_BODY_LIMIT }), apiRouter(ctx))
  app.use('/api', notFoundHandler)

  if (ctx.config.serveClient) serveClientPages(app, options.clientDir ?? resolve('dist'))
  app.use(notFoundHandler)
  app.use(errorHandler(ctx.logger))
  return app
}
