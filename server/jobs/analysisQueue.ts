/**
 * The analysis job queue: jobs live in PostgreSQL (pg-boss), so any number of app instances and
 * `npm run worker` processes can share one database; each job is taken by exactly one worker.
 * A job is leased for LEASE_SECONDS and renewed by the process running it (see jobLeases.ts), so a job whose
 * worker dies is retried within about half a minute; `jobTimeoutSeconds` bounds how long one analysis may run.
 */
import PgBoss from 'pg-boss'
import type { Logger } from 'pino'
import type { Db } from '../db/knex'
import type { AnalysisPool } from './analysisPool'
import type { EventHub } from './eventHub'
import { LEASE_SECONDS, startJobLeases, type JobLeases } from './jobLeases'
import { runAnalysisJob } from './runAnalysisJob'

export const ANALYSIS_QUEUE = 'analysis'

export interface AnalysisJobData {
  analysisId: string
}

export interface QueueSettings {
  databaseUrl: string
  /** Longest an analysis may run; its lease is no longer renewed after that. */
  jobTimeoutSeconds: number
  /** How many times a job is retried after a crash. */
  retryLimit: number
  /** Largest decompressed trace, bytes. */
  maxTraceBytes: number
}

export interface AnalysisQueue {
  enqueue(analysisId: string): Promise<void>
  /** Start taking jobs and running them on `pool`. */
  startWorking(pool: AnalysisPool): Promise<void>
  stop(): Promise<void>
}

export async function createAnalysisQueue(settings: QueueSettings, context: { db: Db; events: EventHub; logger: Logger }): Promise<AnalysisQueue> {
  const { db, events, logger } = context
  const boss = new PgBoss({
    connectionString: settings.databaseUrl,
    schema: 'pgboss',
    max: 4,
    supervise: true,
    // Expired leases are found within this many seconds even when no worker is alive to notice.
    maintenanceIntervalSeconds: 5,
    schedule: false,
  })
  boss.on('error', (error) => logger.error({ err: error }, 'job queue error'))
  await boss.start()
  await boss.createQueue(ANALYSIS_QUEUE, { name: ANALYSIS_QUEUE, retryLimit: settings.retryLimit, retryDelay: 1, expireInSeconds: LEASE_SECONDS })
  let workerId: string | null = null
  let leases: JobLeases | null = null

  return {
    async enqueue(analysisId) {
      await boss.send(ANALYSIS_QUEUE, { analysisId } satisfies AnalysisJobData, {
        retryLimit: settings.retryLimit,
        retryDelay: 1,
        expireInSeconds: LEASE_SECONDS,
      })
      // A worker in this process need not wait for its next poll.
      if (workerId) boss.notifyWorker(workerId)
    },
    async startWorking(pool) {
      const held = (leases = await startJobLeases(boss, ANALYSIS_QUEUE, { db, logger, maxRunSeconds: settings.jobTimeoutSeconds }))
      workerId = await boss.work<AnalysisJobData>(ANALYSIS_QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async (jobs) => {
        for (const job of jobs) {
          held.hold(job.id)
          try {
            await runAnalysisJob(job.data.analysisId, { db, pool, events, logger, maxTraceBytes: settings.maxTraceBytes, maxAttempts: settings.retryLimit + 1 })
          } finally {
            held.release(job.id)
          }
        }
      })
    },
    async stop() {
      leases?.stop()
      await boss.stop({ graceful: true, wait: true, timeout: 10_000 })
    },
  }
}
