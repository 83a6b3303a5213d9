/**
 * Undoing a wrong upload: delete a trace (an admin restores it within 30 days), move it to the cavity it belongs
 * to (and analyse it there), exclude an analysis from history, trends and alerts. Each follows the permission
 * table (one's own uploads, or anyone's with `uploads.correctAny`), is written to the audit log, re-judges the
 * cavity's alerts and tells the open pages.
 */
import { can } from '../../shared/auth/permissions'
import { RESTORE_DAYS, type DeletedTrace } from '../../shared/api/correctionSchemas'
import type { AnalysisRecord, TraceRecord } from '../../shared/api/tuningTypes'
import { rejudgeNewest } from '../alerts/checkAlerts'
import { findAnalysis } from '../analyses/analysisRepository'
import { getAnalysis, latestAnalysisOfTrace } from '../analyses/analysisService'
import { recordAudit } from '../audit/auditData'
import type { Actor } from '../auth/actor'
import { getCavity } from '../cavities/cavityService'
import { HttpError } from '../http/errors'
import { findTrace } from '../traces/traceRepository'
import { getTrace, queueAnalysis, type UploadContext } from '../traces/traceService'
import { deletedAtOf, listDeletedTraces, moveTraceRows, restoreTrace, setExclusion, softDeleteTrace } from './correctionRepository'

const DAY_MS = 86_400_000

/** One's own upload, or anyone's with `uploads.correctAny`. */
function assertMayCorrect(actor: Actor, trace: TraceRecord): void {
  if (trace.uploadedBy === actor.id || can(actor.role, 'uploads.correctAny')) return
  throw new HttpError(403, 'forbidden', 'You may correct only traces you uploaded; a lead or an admin can correct this one.')
}

async function announce(context: UploadContext, cavityId: string, traceId: string, analysisId: string, change: NonNullable<Parameters<UploadContext['events']['publish']>[0]['change']>) {
  const analysis = await findAnalysis(context.db, analysisId)
  await context.events.publish({ type: 'analysis', cavityId, traceId, analysisId, status: analysis?.status ?? 'done', change })
}

const auditActor = (actor: Actor) => ({ id: actor.id, email: actor.email })

export async function deleteTrace(context: UploadContext, actor: Actor, traceId: string, reason: string): Promise<{ trace: TraceRecord; restoreUntil: string }> {
  const trace = await getTrace(context.db, traceId)
  assertMayCorrect(actor, trace)
  const latest = await latestAnalysisOfTrace(context.db, trace.id)
  if (!(await softDeleteTrace(context.db, trace.id, { by: actor.id, reason }))) throw new HttpError(404, 'trace_not_found', `No trace with id ${traceId}.`)
  await recordAudit(context.db, { event: 'trace.deleted', actor: auditActor(actor), subject: trace.fileName, details: { traceId: trace.id, cavityId: trace.cavityId, reason } })
  await rejudgeNewest(context.db, trace.cavityId)
  if (latest) await announce(context, trace.cavityId, trace.id, latest.id, 'deleted')
  return { trace, restoreUntil: new Date(Date.now() + RESTORE_DAYS * DAY_MS).toISOString() }
}

export async function restoreDeletedTrace(context: UploadContext, actor: Actor, traceId: string): Promise<TraceRecord> {
  const deletedAt = await deletedAtOf(context.db, traceId)
  if (!deletedAt) throw new HttpError(404, 'trace_not_deleted', `No deleted trace with id ${traceId}.`)
  if (Date.now() - deletedAt.getTime() > RESTORE_DAYS * DAY_MS) throw new HttpError(410, 'restore_window_passed', `Trace ${traceId} was deleted more than ${RESTORE_DAYS} days ago and can no longer be restored.`)
  await restoreTrace(context.db, traceId)
  const trace = (await findTrace(context.db, traceId))!
  await recordAudit(context.db, { event: 'trace.restored', actor: auditActor(actor), subject: trace.fileName, details: { traceId, cavityId: trace.cavityId } })
  await rejudgeNewest(context.db, trace.cavityId)
  const latest = await latestAnalysisOfTrace(context.db, traceId)
  if (latest) await announce(context, trace.cavityId, traceId, latest.id, 'restored')
  return trace
}

export async function moveTrace(context: UploadContext, actor: Actor, traceId: string, toCavityId: string, reason: string): Promise<{ trace: TraceRecord; analysis: AnalysisRecord }> {
  const trace = await getTrace(context.db, traceId)
  assertMayCorrect(actor, trace)
  const [from, to] = [await getCavity(context.db, trace.cavityId), await getCavity(context.db, toCavityId)]
  if (from.id === to.id) throw new HttpError(409, 'same_cavity', `The trace already belongs to "${to.name}".`)
  if (to.archived) throw new HttpError(409, 'cavity_archived', `Cavity "${to.name}" is archived; un-archive it before moving traces to it.`)
  if (to.pending) throw new HttpError(409, 'cavity_not_approved', `Cavity "${to.name}" waits for approval; move the trace once it is approved.`)
  const previous = await latestAnalysisOfTrace(context.db, trace.id)
  try {
    await moveTraceRows(context.db, trace.id, to.id, { by: actor.id, reason: `Read as "${from.name}" before the trace was moved to "${to.name}".` })
  } catch (error) {
    if ((error as { code?: string }).code === '23505') throw new HttpError(409, 'already_stored', `"${to.name}" already holds the same file; delete this copy instead.`)
    throw error
  }
  await recordAudit(context.db, { event: 'trace.moved', actor: auditActor(actor), subject: trace.fileName, details: { traceId, from: from.id, to: to.id, reason } })
  const moved = (await findTrace(context.db, trace.id))!
  // Analysed again with the new cavity's geometry and the options the lab chose last time.
  const analysis = await queueAnalysis(context, moved, previous?.options ?? {}, actor.id)
  await rejudgeNewest(context.db, from.id)
  if (previous) await announce(context, from.id, trace.id, previous.id, 'moved_away')
  return { trace: moved, analysis }
}

export async function excludeAnalysis(context: UploadContext, actor: Actor, analysisId: string, reason: string | null): Promise<AnalysisRecord> {
  const analysis = await getAnalysis(context.db, analysisId)
  assertMayCorrect(actor, await getTrace(context.db, analysis.traceId))
  await setExclusion(context.db, analysisId, reason === null ? null : { by: actor.id, reason })
  await recordAudit(context.db, {
    event: reason === null ? 'analysis.included' : 'analysis.excluded',
    actor: auditActor(actor),
    subject: analysisId,
    details: { analysisId, cavityId: analysis.cavityId, ...(reason === null ? {} : { reason }) },
  })
  await rejudgeNewest(context.db, analysis.cavityId)
  await announce(context, analysis.cavityId, analysis.traceId, analysisId, reason === null ? 'included' : 'excluded')
  return getAnalysis(context.db, analysisId)
}

export function deletedTraces(context: Pick<UploadContext, 'db'>): Promise<DeletedTrace[]> {
  return listDeletedTraces(context.db)
}
