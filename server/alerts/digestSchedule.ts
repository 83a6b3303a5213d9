/**
 * The weekly digest as a scheduled job in the queue (pg-boss cron): every app instance registers the
 * same schedule and works the queue, and pg-boss makes one job per tick, so each lead gets one digest.
 * A database that is down at start is retried, as for the analysis queue.
 */
import PgBoss from 'pg-boss'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import type { Mailer } from '../mail/mailer'
import { sendWeeklyDigest } from './weeklyDigest'

export const DIGEST_QUEUE = 'weekly-digest'
const RETRY_MS = 30_000

export interface DigestSchedule {
  stop(): Promise<void>
}

export async function startDigestSchedule(
  context: { databaseUrl: string; db: Db; mailer: Mailer; logger: Logger; baseUrl: () => string },
  options: { cron?: string; tz?: string } = {},
): Promise<DigestSchedule> {
  const { logger } = context
  /** @default Mondays 07:00 */
  const cron = options.cron ?? '0 7 * * 1'
  /** @default UTC */
  const tz = options.tz ?? 'UTC'
  let boss: PgBoss | null = null
  let stopped = false
  let retryTimer: NodeJS.Timeout | undefined

  const connect = async (): Promise<void> => {
    const fresh = new PgBoss({ connectionString: context.databaseUrl, schema: 'pgboss', max: 2, supervise: false, schedule: true })
    fresh.on('error', (error) => logger.error({ err: error }, 'digest schedule error'))
    try {
      await fresh.start()
      await fresh.createQueue(DIGEST_QUEUE, { name: DIGEST_QUEUE, retryLimit: 2, retryDelay: 60, expireInSeconds: 600 })
      await fresh.schedule(DIGEST_QUEUE, cron, {}, { tz })
      await fresh.work(DIGEST_QUEUE, { pollingIntervalSeconds: 30 }, async () => {
        const sent = await sendWeeklyDigest({ db: context.db, mailer: context.mailer, baseUrl: context.baseUrl() })
        if (sent.failed.length > 0) logger.error({ failed: sent.failed }, 'weekly digest could not be sent to some leads')
        logger.info({ recipients: sent.recipients.length }, 'weekly digest sent')
      })
      if (stopped) return void (await fresh.stop({ graceful: false, wait: true }))
      boss = fresh
    } catch (error) {
      logger.warn({ err: error }, 'digest schedule not reachable; retrying')
      await fresh.stop({ graceful: false, wait: false }).catch(() => undefined)
      if (!stopped) retryTimer = setTimeout(() => void connect(), RETRY_MS).unref()
    }
  }
  await connect()

  return {
    async stop() {
      stopped = true
      clearTimeout(retryTimer)
      await boss?.stop({ graceful: true, wait: true, timeout: 5000 })
    },
  }
}
