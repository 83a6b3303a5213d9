/** Data access for uploaded traces. The raw bytes are only loaded when asked for. */
import type { TraceRecord } from '../../shared/api/tuningTypes'
import type { Db } from '../db/knex'
import { readContentChunks, writeContentChunks } from './traceContentChunks'

export type { TraceRecord }

interface TraceRow {
  id: string
  cavity_id: string
  sha256: string
  file_name: string
  size_bytes: string | number
  note: string
  uploaded_by: number | null
  uploaded_at: Date
  content_gzip?: Buffer | null
}

const columns = ['id', 'cavity_id', 'sha256', 'file_name', 'size_bytes', 'note', 'uploaded_by', 'uploaded_at']

function toTrace(row: TraceRow): TraceRecord {
  return {
    id: row.id,
    cavityId: row.cavity_id,
    sha256: row.sha256,
    fileName: row.file_name,
    sizeBytes: Number(row.size_bytes),
    note: row.note,
    uploadedBy: row.uploaded_by,
    uploadedAt: row.uploaded_at.toISOString(),
  }
}

export async function findTraceBySha(db: Db, cavityId: string, sha256: string): Promise<TraceRecord | null> {
  const row = (await db('traces').where({ cavity_id: cavityId, sha256 }).first(columns)) as TraceRow | undefined
  return row ? toTrace(row) : null
}

/** A stored trace; a deleted one only with `includeDeleted` (an admin restoring it). */
export async function findTrace(db: Db, id: string, options: { includeDeleted?: boolean } = {}): Promise<TraceRecord | null> {
  const row = (await db('traces')
    .where({ id })
    .modify((query) => {
      if (!options.includeDeleted) query.whereNull('deleted_at')
    })
    .first(columns)) as TraceRow | undefined
  return row ? toTrace(row) : null
}

/**
 * Insert a trace; when the same file is already stored for the cavity, return the existing one. The content comes
 * whole (`contentGzip`) or as a gzip file (`gzipPath`) stored in chunks, in one transaction with the row.
 */
export async function insertTrace(
  db: Db,
  trace: { cavityId: string; sha256: string; fileName: string; sizeBytes: number; note: string; uploadedBy: number | null } & ({ contentGzip: Buffer } | { gzipPath: string }),
): Promise<{ trace: TraceRecord; created: boolean }> {
  const created = await db.transaction(async (trx) => {
    // The same file uploaded again after it was deleted is a fresh upload: the deleted copy goes for good.
    await trx('traces').where({ cavity_id: trace.cavityId, sha256: trace.sha256 }).whereNotNull('deleted_at').delete()
    const rows = await trx<TraceRow>('traces')
      .insert({
        cavity_id: trace.cavityId,
        sha256: trace.sha256,
        file_name: trace.fileName,
        size_bytes: trace.sizeBytes,
        content_gzip: 'contentGzip' in trace ? trace.contentGzip : null,
        note: trace.note,
        uploaded_by: trace.uploadedBy,
      })
      .onConflict(['cavity_id', 'sha256'])
      .ignore()
      .returning(columns)
    if (rows.length > 0 && 'gzipPath' in trace) await writeContentChunks(trx, (rows[0] as TraceRow).id, trace.gzipPath)
    return rows[0] as TraceRow | undefined
  })
  if (created) return { trace: toTrace(created), created: true }
  const existing = await findTraceBySha(db, trace.cavityId, trace.sha256)
  if (!existing) throw new Error('trace vanished between insert and read')
  return { trace: existing, created: false }
}

/** The stored gzip bytes of a trace (whole, or joined from its chunks). */
export async function readTraceContent(db: Db, id: string): Promise<Buffer | null> {
  const row = await db<TraceRow>('traces').select('content_gzip').where({ id }).first()
  if (!row) return null
  return row.content_gzip ?? (await readContentChunks(db, id))
}
