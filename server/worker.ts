/**
 * `npm run worker`: a process that only runs analyses, against the same database as the app. Start
 * as many as the lab needs, on as many machines; each job is taken by exactly one of them.
 */
import pino from 'pino'
import { ConfigError, loadConfig } from './config'
import { createDb } from './db/knex'
import { startAnalysisService } from './jobs/startAnalysisService'

async function main(): Promise<void> {
  const config = loadConfig()
  const logger = pino({ level: config.LOG_LEVEL }).child({ role: 'worker' })
  const db = createDb(config.DATABASE_URL, { logger, poolMax: 4 })
  const service = await startAnalysisService(config, { db, logger, threads: Math.max(1, config.WORKER_THREADS) })
  logger.info({ threads: Math.max(1, config.WORKER_THREADS) }, 'analysis worker is taking jobs')
  process.stdout.write('CAVITRACE_WORKER_READY\n')
  const shutdown = () => {
    service
      .stop()
      .then(() => db.destroy())
      .then(
        () => process.exit(0),
        () => process.exit(1),
      )
  }
  process.once('SIGINT', shutdown)
  process.once('SIGTERM', shutdown)
}

main().catch((error: unknown) => {
  process.stderr.write(`cavitrace worker: ${error instanceof ConfigError ? error.message : error instanceof Error ? error.stack : String(error)}\n`)
  process.exit(1)
})
