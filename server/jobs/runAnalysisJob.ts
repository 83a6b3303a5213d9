/**
 * One analysis job: load the stored trace, run the engine on a worker thread, store the outcome,
 * announce it. Bad input ends as a failed analysis (the trace stays); a crash throws so the queue retries.
 */
import type { Logger } from 'pino'
import { checkAlertsSafely } from '../alerts/checkAlerts'
import { finishAnalysis, markAnalysisRunning } from '../analyses/analysisRepository'
import type { Db } from '../db/knex'
import { readTraceContent } from '../traces/traceRepository'
import type { AnalysisPool } from './analysisPool'
import { thisWorker } from './jobLeases'
import type { EventHub } from './eventHub'

export interface JobContext {
  db: Db
  pool: AnalysisPool
  events: EventHub
  logger: Logger
  maxTraceBytes: number
  /** Attempts allowed in all (first try + retries); the last one records a crash as a failure. */
  maxAttempts: number
}

export async function runAnalysisJob(analysisId: string, context: JobContext): Promise<void> {
  const { db, pool, events, logger } = context
  const analysis = await markAnalysisRunning(db, analysisId, thisWorker)
  if (!analysis) {
    logger.info({ analysisId }, 'analysis already finished or removed; skipping job')
    return
  }
  const announce = (status: 'running' | 'done' | 'failed') =>
    events.publish({ type: 'analysis', cavityId: analysis.cavityId, analysisId, traceId: analysis.traceId, status }).catch((error: unknown) => logger.warn({ err: error }, 'could not announce analysis status'))
  await announce('running')

  const content = await readTraceContent(db, analysis.traceId)
  if (!content) {
    await finishAnalysis(db, analysisId, { error: { code: 'trace_missing', message: 'The trace of this analysis is no longer stored.' } })
    await announce('failed')
    return
  }
  const gzipped = new Uint8Array(content.byteLength)
  gzipped.set(content)
  let outcome: Awaited<ReturnType<AnalysisPool['run']>>
  try {
    const cavity = (await db('cavities').where({ id: analysis.cavityId }).first('sample_interval_s')) as { sample_interval_s: number | null } | undefined
    outcome = await pool.run({ gzipped, geometry: analysis.geometry, options: analysis.options, maxBytes: context.maxTraceBytes, fallbackIntervalSeconds: cavity?.sample_interval_s ?? null })
  } catch (error) {
    if (analysis.attempts < context.maxAttempts) throw error // the queue retries it
    logger.error({ err: error, analysisId }, 'analysis crashed on its last attempt')
    outcome = { ok: false, error: { code: 'engine_crashed', message: `The analysis crashed ${analysis.attempts} times; the trace is kept and can be re-analysed.` } }
  }
  if (outcome.ok) {
    await finishAnalysis(db, analysisId, { result: outcome.result, engineMs: outcome.milliseconds })
    await checkAlertsSafely(analysisId, { db, logger })
    await announce('done')
  } else {
    await finishAnalysis(db, analysisId, { error: outcome.error })
    await announce('failed')
  }
  logger.info({ analysisId, status: outcome.ok ? 'done' : 'failed', attempts: analysis.attempts }, 'analysis finished')
}
