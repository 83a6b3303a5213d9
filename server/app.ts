/**
 * The Express application: middleware, API routes by business area, the built client, and the one
 * error handler. No listening here (see server.ts), so tests can build it in-process.
 */
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import compression from 'compression'
import express, { type Express } from 'express'
import helmet from 'helmet'
import type { Logger } from 'pino'
import { pinoHttp } from 'pino-http'
import type { AppConfig } from './config'
import type { Db } from './db/knex'
import { healthRoutes } from './health/healthRoutes'
import { apiNotFound, errorHandler } from './http/errors'

export interface AppContext {
  config: AppConfig
  db: Db
  logger: Logger
}

export function createApp(context: AppContext): Express {
  const { config, db, logger } = context
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', 'loopback')
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          // PrimeVue writes its theme as inline <style>; everything else comes from this origin.
          'style-src': ["'self'", "'unsafe-inline'"],
          'img-src': ["'self'", 'data:', 'blob:'],
          'upgrade-insecure-requests': null,
        },
      },
    }),
  )
  app.use(compression())
  app.use(pinoHttp({ logger, autoLogging: { ignore: (req) => req.url === '/api/health' } }))
  app.use(express.json({ limit: '1mb' }))

  const api = express.Router()
  api.use(healthRoutes(db))
  api.use(apiNotFound)
  app.use('/api', api)

  const clientDir = resolve(config.CLIENT_DIR)
  if (existsSync(resolve(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    // Client-side routes: every other GET gets the app shell.
    app.get(/.*/, (_req, res) => res.sendFile(resolve(clientDir, 'index.html')))
  }

  app.use(errorHandler(logger))
  return app
}
