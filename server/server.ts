/**
 * Start and stop the HTTP server. Exported for tests, which run it in-process on port 0.
 */
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import pino, { type Logger } from 'pino'
import { startDigestSchedule, type DigestSchedule } from './alerts/digestSchedule'
import { startPurgeSchedule } from './corrections/purgeSchedule'
import { createApp } from './app'
import { bootstrapAdmin } from './auth/bootstrapAdmin'
import { sessionSecretSource } from './auth/sessionSecret'
import { mailCaptureOn, publicBaseUrl, type AppConfig } from './config'
import { createDb, type Db } from './db/knex'
import { startAnalysisService, type AnalysisService } from './jobs/startAnalysisService'
import { startCaptureSmtp, type CaptureSmtp } from './mail/captureSmtp'
import { createMailer, type Mailer } from './mail/mailer'
import { startAlertMailDispatcher, type AlertMailDispatcher } from './notifications/alertMailDispatcher'

/** For tests: how many planner threads this process has ended (read from the same build as the server). */
export { planThreadsEnded } from './plans/planPool'

export interface RunningServer {
  /** Base URL, e.g. http://127.0.0.1:3000 */
  url: string
  port: number
  db: Db
  logger: Logger
  mailer: Mailer
  /** Port of the local SMTP fake when MAIL_CAPTURE is on. */
  mailCapturePort?: number
  /** The analysis queue, worker threads and event hub of this process. */
  analysis: AnalysisService
  /** Sends the e-mail of alert notifications (polls; `drain()` sends what waits now). */
  alertMail: AlertMailDispatcher
  /** The weekly digest job (pg-boss cron on DIGEST_SCHEDULE; null when it is off). */
  digest: DigestSchedule | null
  /** Stop accepting connections, finish open requests, close the database pool. */
  stop(): Promise<void>
}

export class PortInUseError extends Error {
  constructor(host: string, port: number) {
    super(`Port ${port} on ${host} is already in use. Stop the program using it or set PORT to another port.`)
    this.name = 'PortInUseError'
  }
}

export async function startServer(config: AppConfig, options: { logger?: Logger } = {}): Promise<RunningServer> {
  const logger = options.logger ?? pino({ level: config.LOG_LEVEL })
  // Read first: a bad secret file stops the start before anything else opens.
  const sessionSecret = sessionSecretSource(config, logger)
  const db = createDb(config.DATABASE_URL, { logger })
  const capture: CaptureSmtp | undefined = mailCaptureOn(config) ? await startCaptureSmtp(db, logger) : undefined
  const mailer = createMailer(config, logger, { capturePort: capture?.port })
  let listeningUrl = ''
  const analysis = await startAnalysisService(config, { db, logger, threads: config.WORKER_THREADS })
  const app = createApp({ config, db, logger, mailer, queue: analysis.queue, events: analysis.events, sessionSecret, publicUrl: () => publicBaseUrl(config, listeningUrl) })
  const alertMail = startAlertMailDispatcher({ db, mailer, logger, baseUrl: () => publicBaseUrl(config, listeningUrl) })
  const purge = startPurgeSchedule({ db, logger })
  const digest: DigestSchedule | null =
    config.DIGEST_SCHEDULE === 'off'
      ? null
      : await startDigestSchedule({ databaseUrl: config.DATABASE_URL, db, mailer, logger, baseUrl: () => publicBaseUrl(config, listeningUrl) }, { cron: config.DIGEST_SCHEDULE, tz: config.DIGEST_TIMEZONE })

  const server = await new Promise<Server>((resolve, reject) => {
    const listening = app.listen(config.PORT, config.HOST)
    listening.once('listening', () => resolve(listening))
    listening.once('error', (error: NodeJS.ErrnoException) => {
      reject(error.code === 'EADDRINUSE' ? new PortInUseError(config.HOST, config.PORT) : error)
    })
  }).catch(async (error: unknown) => {
    purge.stop()
    await digest?.stop()
    await alertMail.stop()
    await analysis.stop()
    await capture?.stop()
    await db.destroy()
    throw error
  })

  const port = (server.address() as AddressInfo).port
  listeningUrl = `http://${config.HOST}:${port}`
  // The first admin; a database that is down now must not stop the server (health reports it).
  await bootstrapAdmin(db, { email: config.CAVITRACE_ADMIN_EMAIL, password: config.CAVITRACE_ADMIN_PASSWORD }).then(
    (result) => {
      if (result === 'created' || result === 'promoted') logger.info({ email: config.CAVITRACE_ADMIN_EMAIL, result }, 'first admin set up from CAVITRACE_ADMIN_EMAIL')
    },
    (error: unknown) => logger.error({ err: error }, 'could not set up the first admin'),
  )
  let stopping: Promise<void> | undefined
  return {
    url: listeningUrl,
    port,
    db,
    logger,
    mailer,
    mailCapturePort: capture?.port,
    analysis,
    alertMail,
    digest,
    stop() {
      stopping ??= (async () => {
        await new Promise<void>((resolve) => {
          server.close(() => resolve())
          server.closeIdleConnections()
          // Long-lived connections (event streams) must not hold the shutdown forever.
          setTimeout(() => server.closeAllConnections(), 5000).unref()
        })
        purge.stop()
        await digest?.stop()
        await alertMail.stop()
        await analysis.stop()
        await mailer.settle()
        await capture?.stop()
        await db.destroy()
      })()
      return stopping
    },
  }
}
