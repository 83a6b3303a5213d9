/**
 * Deleted traces stay restorable for 30 days; then every app instance removes them for good, a few times a day.
 * A plain timer is enough: the delete is idempotent, so several instances doing it at once is harmless.
 */
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import { purgeDeletedTraces } from './correctionRepository'

const EVERY_MS = 6 * 3_600_000

export function startPurgeSchedule(context: { db: Db; logger: Logger }): { stop(): void } {
  const run = () =>
    purgeDeletedTraces(context.db)
      .then((count) => (count > 0 ? context.logger.info({ count }, 'deleted traces past the restore window removed') : undefined))
      .catch((error: unknown) => context.logger.warn({ err: error }, 'could not remove old deleted traces'))
  const first = setTimeout(() => void run(), 60_000).unref()
  const timer = setInterval(() => void run(), EVERY_MS).unref()
  return {
    stop() {
      clearTimeout(first)
      clearInterval(timer)
    },
  }
}
