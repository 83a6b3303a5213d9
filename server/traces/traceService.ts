/**
 * Upload use case: keep the raw file (gzip-compressed, with its SHA-256; the same file twice for the
 * same cavity links to the stored one) and queue its analysis. Nothing is parsed here: a file that is
 * not a trace becomes a failed analysis with a clear error, and the file stays.
 */
import type { AnalysisOptions } from '../../shared/api/cavitySchemas'
import type { UploadOutcome } from '../../shared/api/tuningTypes'
import { finishAnalysis, insertAnalysis, type AnalysisRecord } from '../analyses/analysisRepository'
import { latestAnalysisOfTrace } from '../analyses/analysisService'
import { rememberSampleInterval } from '../cavities/cavityRepository'
import { geometryOf, getCavity } from '../cavities/cavityService'
import type { Db } from '../db/knex'
import type { AnalysisQueue } from '../jobs/analysisQueue'
import type { EventHub } from '../jobs/eventHub'
import { HttpError } from '../http/errors'
import { findTrace, insertTrace, type TraceRecord } from './traceRepository'

export interface UploadContext {
  db: Db
  queue: Pick<AnalysisQueue, 'enqueue'>
  events: EventHub
}

/** A file as `receiveTraceFiles` leaves it: hashed and compressed into a temporary file. */
export interface UploadedFile {
  fileName: string
  sha256: string
  sizeBytes: number
  /** Temporary file holding the content gzip-compressed. */
  gzipPath: string
}

export type { UploadOutcome }

/** Create an analysis of a stored trace with the cavity's current geometry, and queue it. */
export async function queueAnalysis(context: UploadContext, trace: TraceRecord, options: AnalysisOptions, userId: number | null): Promise<AnalysisRecord> {
  const cavity = await getCavity(context.db, trace.cavityId)
  // Given once for a one-column export, it becomes the cavity's default for the next ones.
  if (options.sampleIntervalSeconds !== undefined) await rememberSampleInterval(context.db, cavity.id, options.sampleIntervalSeconds)
  const analysis = await insertAnalysis(context.db, { traceId: trace.id, cavityId: cavity.id, options, geometry: geometryOf(cavity), requestedBy: userId })
  try {
    await context.queue.enqueue(analysis.id)
  } catch (error) {
    // The trace is stored either way; record why this analysis did not run, so it can be re-run.
    const message = error instanceof HttpError ? error.message : 'The analysis could not be queued.'
    await finishAnalysis(context.db, analysis.id, { error: { code: 'queue_unavailable', message } })
    throw error
  }
  await context.events.publish({ type: 'analysis', cavityId: cavity.id, analysisId: analysis.id, traceId: trace.id, status: 'queued' })
  return analysis
}

export async function uploadTraces(context: UploadContext, cavityId: string, files: UploadedFile[], note: string, userId: number | null, options: AnalysisOptions = {}): Promise<UploadOutcome[]> {
  if (files.length === 0) throw new HttpError(400, 'no_file', 'No file was uploaded: send the export in the multipart field "file".')
  const cavity = await getCavity(context.db, cavityId)
  if (cavity.archived) throw new HttpError(409, 'cavity_archived', `Cavity "${cavity.name}" is archived; un-archive it before uploading.`)
  if (cavity.pending) throw new HttpError(409, 'cavity_not_approved', `Cavity "${cavity.name}" is proposed and waits for a lead or an admin to approve it; upload once it is approved.`)
  const outcomes: UploadOutcome[] = []
  for (const file of files) {
    // Stored from the temporary file in 1 MiB pieces: never whole in memory.
    const { trace, created } = await insertTrace(context.db, { cavityId, sha256: file.sha256, fileName: file.fileName, sizeBytes: file.sizeBytes, gzipPath: file.gzipPath, note, uploadedBy: userId })
    const existing = created ? null : await latestAnalysisOfTrace(context.db, trace.id)
    const analysis = existing ?? (await queueAnalysis(context, trace, options, userId))
    outcomes.push({ trace, analysis, created })
  }
  return outcomes
}

export async function getTrace(db: Db, id: string): Promise<TraceRecord> {
  const trace = await findTrace(db, id)
  if (!trace) throw new HttpError(404, 'trace_not_found', `No trace with id ${id}.`)
  return trace
}
