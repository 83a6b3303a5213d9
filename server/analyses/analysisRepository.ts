/** Data access for analyses. */
import type { AnalysisOptions, AnalysisStatus } from '../../shared/api/cavitySchemas'
import type { AnalysisRecord, HistoryRow } from '../../shared/api/tuningTypes'
import type { CavityGeometry } from '../../shared/cavity'
import type { AnalysisResult } from '../../shared/analysis/types'
import { judgeResultTrust, trustInputOf } from '../../shared/api/resultTrust'
import type { Db } from '../db/knex'

export type { AnalysisRecord, HistoryRow }


interface AnalysisRow {
  id: string
  /** The process running it (host name, process id), for handing on a dead worker's job. */
  worker_host?: string | null
  worker_pid?: number | null
  trace_id: string
  cavity_id: string
  status: AnalysisStatus
  options: AnalysisOptions
  geometry: CavityGeometry
  result: AnalysisResult | null
  error: { code: string; message: string } | null
  attempts: number
  engine_ms: number | null
  requested_by: number | null
  created_at: Date
  started_at: Date | null
  finished_at: Date | null
  deleted_at: Date | null
  excluded_at: Date | null
  excluded_by: number | null
  exclusion_reason: string | null
}

function toAnalysis(row: AnalysisRow): AnalysisRecord {
  return {
    id: row.id,
    traceId: row.trace_id,
    cavityId: row.cavity_id,
    status: row.status,
    options: row.options,
    geometry: row.geometry,
    result: row.result,
    error: row.error,
    attempts: row.attempts,
    engineMs: row.engine_ms,
    requestedBy: row.requested_by,
    createdAt: row.created_at.toISOString(),
    startedAt: row.started_at?.toISOString() ?? null,
    finishedAt: row.finished_at?.toISOString() ?? null,
    excluded: row.excluded_at ? { at: row.excluded_at.toISOString(), by: row.excluded_by, reason: row.exclusion_reason ?? '' } : null,
    deleted: row.deleted_at !== null,
  }
}

export async function insertAnalysis(
  db: Db,
  analysis: { traceId: string; cavityId: string; options: AnalysisOptions; geometry: CavityGeometry; requestedBy: number | null },
): Promise<AnalysisRecord> {
  const [row] = await db<AnalysisRow>('analyses')
    .insert({
      trace_id: analysis.traceId,
      cavity_id: analysis.cavityId,
      options: JSON.stringify(analysis.options) as unknown as AnalysisOptions,
      geometry: JSON.stringify(analysis.geometry) as unknown as CavityGeometry,
      requested_by: analysis.requestedBy,
    })
    .returning('*')
  return toAnalysis(row as AnalysisRow)
}

export async function findAnalysis(db: Db, id: string): Promise<AnalysisRecord | null> {
  const row = await db<AnalysisRow>('analyses').where({ id }).first()
  return row ? toAnalysis(row) : null
}

/** Mark an analysis as running (and count the attempt); null when it no longer exists or is finished. */
/** Mark an analysis running (one more attempt), recording which process runs it. */
export async function markAnalysisRunning(db: Db, id: string, worker?: { host: string; pid: number }): Promise<AnalysisRecord | null> {
  const [row] = await db<AnalysisRow>('analyses')
    .where({ id })
    .whereNull('deleted_at')
    .whereIn('status', ['queued', 'running'])
    .update({ status: 'running', started_at: db.fn.now() as unknown as Date, attempts: db.raw('attempts + 1') as unknown as number, worker_host: worker?.host ?? null, worker_pid: worker?.pid ?? null })
    .returning('*')
  return row ? toAnalysis(row as AnalysisRow) : null
}

export async function finishAnalysis(
  db: Db,
  id: string,
  outcome: { result: AnalysisResult; engineMs: number } | { error: { code: string; message: string } },
): Promise<void> {
  const update =
    'result' in outcome
      ? {
          status: 'done' as const,
          result: JSON.stringify(outcome.result) as unknown as AnalysisResult,
          error: null,
          fundamental_fraction: outcome.result.fundamentalFraction,
          finesse: outcome.result.finesse,
          linewidth_hz: outcome.result.linewidthHz,
          engine_ms: outcome.engineMs,
        }
      : { status: 'failed' as const, error: JSON.stringify(outcome.error) as unknown as AnalysisRow['error'], result: null }
  await db('analyses')
    .where({ id })
    .update({ ...update, finished_at: db.fn.now() })
}


/**
 * A cavity's analyses, newest first, with their trace's note; deleted traces' analyses are left out, excluded ones
 * kept (marked) so they can be included again. Each row says whether its number is in doubt and, when failed, why.
 */
export async function listCavityHistory(db: Db, cavityId: string, options: { from?: Date; to?: Date; limit?: number } = {}): Promise<HistoryRow[]> {
  const query = db('analyses as a')
    .join('traces as t', 't.id', 'a.trace_id')
    .where('a.cavity_id', cavityId)
    .whereNull('a.deleted_at')
    .orderBy('a.created_at', 'desc')
    .limit(options.limit ?? 500)
    .select(
      'a.id', 'a.trace_id', 'a.created_at', 't.file_name', 't.note', 'a.status', 'a.fundamental_fraction', 'a.finesse', 'a.linewidth_hz', 'a.exclusion_reason', 'a.excluded_at',
      db.raw(`a.result -> 'fundamentalFractionError' as fraction_error`),
      db.raw(`coalesce(a.result -> 'warnings', '[]'::jsonb) as warnings`),
      db.raw(`coalesce(a.result -> 'orders', '{}'::jsonb) as orders`),
      db.raw(`a.error ->> 'message' as error_message`),
    )
  if (options.from) query.where('a.created_at', '>=', options.from)
  if (options.to) query.where('a.created_at', '<=', options.to)
  const rows = (await query) as Array<{
    id: string
    trace_id: string
    created_at: Date
    file_name: string
    note: string
    status: AnalysisStatus
    fundamental_fraction: number | null
    finesse: number | null
    linewidth_hz: number | null
    exclusion_reason: string | null
    excluded_at: Date | null
    fraction_error: number | null
    warnings: Array<{ code: string }>
    orders: Record<string, number>
    error_message: string | null
  }>
  return rows.map((row) => ({
    analysisId: row.id,
    traceId: row.trace_id,
    createdAt: row.created_at.toISOString(),
    fileName: row.file_name,
    note: row.note,
    status: row.status,
    fundamentalFraction: row.fundamental_fraction,
    fundamentalFractionError: typeof row.fraction_error === 'number' ? row.fraction_error : null,
    finesse: row.finesse,
    linewidthHz: row.linewidth_hz,
    doubt: row.status === 'done' && row.fundamental_fraction !== null ? judgeResultTrust(trustInputOf({ fundamentalFraction: row.fundamental_fraction, warnings: row.warnings, orders: row.orders })).summary : null,
    excluded: row.excluded_at ? { reason: row.exclusion_reason ?? '' } : null,
    error: row.error_message,
  }))
}
