/**
 * Wire the analysis machinery for one process: the event hub, the job queue and (when this process
 * runs analyses) the worker-thread pool. Used by the app server and by the stand-alone worker.
 * A database that is down at start does not stop the process: the queue keeps trying to connect,
 * and until it does, enqueueing answers 503 (the trace itself is already stored).
 */
import type { Logger } from 'pino'
import type { AppConfig } from '../config'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { createAnalysisPool, type AnalysisPool } from './analysisPool'
import { createAnalysisQueue, type AnalysisQueue } from './analysisQueue'
import { createEventHub, type EventHub } from './eventHub'

const RETRY_MS = 5000

export interface AnalysisService {
  queue: Pick<AnalysisQueue, 'enqueue'>
  events: EventHub
  /** Resolves once the queue is connected (and, with threads, taking jobs). */
  ready(): Promise<void>
  stop(): Promise<void>
}

export async function startAnalysisService(config: AppConfig, context: { db: Db; logger: Logger; threads: number }): Promise<AnalysisService> {
  const { db, logger, threads } = context
  const events = createEventHub({ databaseUrl: config.DATABASE_URL, db, logger })
  let queue: AnalysisQueue | null = null
  let pool: AnalysisPool | null = null
  let stopped = false
  let retryTimer: NodeJS.Timeout | undefined
  let markReady: () => void = () => undefined
  const readyPromise = new Promise<void>((resolve) => {
    markReady = resolve
  })

  const connect = async (): Promise<void> => {
    try {
      const started = await createAnalysisQueue(
        {
          databaseUrl: config.DATABASE_URL,
          jobTimeoutSeconds: config.ANALYSIS_JOB_TIMEOUT_SECONDS,
          retryLimit: config.ANALYSIS_RETRY_LIMIT,
          maxTraceBytes: Math.round(config.UPLOAD_LIMIT_MB * 1024 * 1024),
        },
        { db, events, logger },
      )
      if (stopped) return void (await started.stop())
      if (threads > 0) {
        // Tests start many short-lived servers: warming each one's threads would only add load.
        pool = createAnalysisPool({ threads, warmUp: config.NODE_ENV !== 'test' })
        await started.startWorking(pool)
      }
      queue = started
      markReady()
    } catch (error) {
      logger.warn({ err: error }, 'analysis queue not reachable; retrying')
      if (!stopped) retryTimer = setTimeout(() => void connect(), RETRY_MS)
    }
  }
  await connect()

  return {
    queue: {
      async enqueue(analysisId) {
        if (!queue) throw new HttpError(503, 'queue_unavailable', 'The analysis queue is not reachable right now; the trace is stored — re-run its analysis in a moment.')
        await queue.enqueue(analysisId)
      },
    },
    events,
    ready: () => readyPromise,
    async stop() {
      stopped = true
      clearTimeout(retryTimer)
      await queue?.stop()
      await pool?.close()
      await events.close()
    },
  }
}
