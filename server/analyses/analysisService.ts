/** Analysis use cases: read one, list a trace's, find the latest. */
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { findAnalysis, type AnalysisRecord } from './analysisRepository'

export async function getAnalysis(db: Db, id: string): Promise<AnalysisRecord> {
  const analysis = await findAnalysis(db, id)
  if (!analysis) throw new HttpError(404, 'analysis_not_found', `No analysis with id ${id}.`)
  if (analysis.deleted) throw new HttpError(404, 'analysis_deleted', `The trace of analysis ${id} was deleted; an admin can restore it within 30 days (Admin → Deleted traces).`)
  return analysis
}

export async function latestAnalysisOfTrace(db: Db, traceId: string): Promise<AnalysisRecord | null> {
  const row = await db('analyses').where({ trace_id: traceId }).orderBy('created_at', 'desc').first('id')
  return row ? findAnalysis(db, row.id as string) : null
}

export async function listTraceAnalyses(db: Db, traceId: string): Promise<Array<Pick<AnalysisRecord, 'id' | 'status' | 'createdAt' | 'options'>>> {
  const rows = (await db('analyses').where({ trace_id: traceId }).orderBy('created_at', 'desc').select('id', 'status', 'created_at', 'options')) as Array<{
    id: string
    status: AnalysisRecord['status']
    created_at: Date
    options: AnalysisRecord['options']
  }>
  return rows.map((row) => ({ id: row.id, status: row.status, createdAt: row.created_at.toISOString(), options: row.options }))
}
