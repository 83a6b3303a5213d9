/**
 * The Express application: middleware, API routes by business area, the built client, and the one
 * error handler. No listening here (see server.ts), so tests can build it in-process.
 */
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import compression from 'compression'
import cookieParser from 'cookie-parser'
import express, { type Express } from 'express'
import helmet from 'helmet'
import type { Logger } from 'pino'
import { pinoHttp } from 'pino-http'
import { alertRoutes } from './alerts/alertRoutes'
import { analysisRoutes } from './analyses/analysisRoutes'
import { auditRoutes } from './audit/auditRoutes'
import type { AccountsContext } from './auth/accountsContext'
import { actorOf } from './auth/actor'
import { authenticate } from './auth/authenticate'
import { authRoutes } from './auth/authRoutes'
import { csrfProtection } from './auth/csrf'
import { mailCaptureOn, type AppConfig } from './config'
import type { Db } from './db/knex'
import { healthRoutes } from './health/healthRoutes'
import { cavityRoutes } from './cavities/cavityRoutes'
import { correctionRoutes } from './corrections/correctionRoutes'
import { proposalRoutes } from './cavities/proposalRoutes'
import type { AnalysisQueue } from './jobs/analysisQueue'
import type { EventHub } from './jobs/eventHub'
import { traceRoutes } from './traces/traceRoutes'
import { apiNotFound, errorHandler } from './http/errors'
import { refuseNulBytes } from './http/refuseNulBytes'
import { invitationsRoutes } from './invitations/invitationsRoutes'
import { lensRoutes } from './lenses/lensRoutes'
import { logbookRoutes } from './logbook/logbookRoutes'
import { outboxRoutes } from './mail/outboxRoutes'
import { notificationRoutes } from './notifications/notificationRoutes'
import { overviewRoutes } from './overview/overviewRoutes'
import { planRoutes } from './plans/planRoutes'
import { tokensRoutes } from './tokens/tokensRoutes'
import { usersRoutes } from './users/usersRoutes'

export interface AppContext extends AccountsContext {
  config: AppConfig
  db: Db
  logger: Logger
  /** Where analyses are queued. */
  queue: Pick<AnalysisQueue, 'enqueue'>
  /** Analysis status events (PostgreSQL NOTIFY), for the live streams. */
  events: EventHub
}

/** Express's "trust proxy" from TRUST_PROXY: a hop count, or names/addresses; false when unset. */
export function trustProxySetting(value: string | undefined): boolean | number | string {
  if (!value) return false
  return /^\d+$/.test(value) ? Number(value) : value
}

export function createApp(context: AppContext): Express {
  const { config, db, logger } = context
  const app = express()
  app.disable('x-powered-by')
  // Proxy headers only from the proxy the operator names (TRUST_PROXY); by default nobody's.
  app.set('trust proxy', trustProxySetting(config.TRUST_PROXY))
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
  app.use(
    pinoHttp({
      logger,
      autoLogging: { ignore: (req) => req.url === '/api/health' },
      // Credentials never reach the log.
      redact: ['req.headers.authorization', 'req.headers.cookie', 'res.headers["set-cookie"]'],
    }),
  )
  app.use(express.json({ limit: '1mb' }))
  app.use(cookieParser())
  app.use('/api', refuseNulBytes)

  const api = express.Router()
  api.use(healthRoutes(db))
  // Who is asking (API token or session cookie), then refuse cross-site writes, then the routes.
  api.use(authenticate(db, context.sessionSecret))
  // What a signed-in person reads is theirs: no browser or proxy cache keeps it.
  api.use((req, res, next) => {
    if (actorOf(req)) res.set('Cache-Control', 'no-store')
    next()
  })
  api.use(csrfProtection(config))
  api.use(authRoutes(context))
  api.use(usersRoutes(db))
  api.use(invitationsRoutes(context))
  api.use(tokensRoutes(db))
  api.use(auditRoutes(db))
  api.use(cavityRoutes(context))
  api.use(proposalRoutes(context))
  api.use(traceRoutes(context))
  api.use(correctionRoutes(context))
  // Before the analysis routes: /analyses/compare must not be read as /analyses/:id.
  api.use(overviewRoutes(context))
  api.use(analysisRoutes(context))
  api.use(logbookRoutes(context))
  api.use(alertRoutes(context))
  api.use(notificationRoutes(context))
  api.use(lensRoutes(context))
  api.use(planRoutes(context))
  if (mailCaptureOn(config)) api.use(outboxRoutes(db))
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
