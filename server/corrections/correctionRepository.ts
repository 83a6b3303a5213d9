/** Data access for undoing uploads: soft delete and restore of traces, moves, exclusions. Plain objects out. */
import { RESTORE_DAYS, type DeletedTrace } from '../../shared/api/correctionSchemas'
import type { Db } from '../db/knex'

const DAY_MS = 86_400_000

/** Mark a trace and its analyses deleted; false when it was already deleted or does not exist. */
export async function softDeleteTrace(db: Db, traceId: string, change: { by: number | null; reason: string }): Promise<boolean> {
  return db.transaction(async (trx) => {
    const updated = await trx('traces').where({ id: traceId }).whereNull('deleted_at').update({ deleted_at: trx.fn.now(), deleted_by: change.by, delete_reason: change.reason })
    if (updated === 0) return false
    await trx('analyses').where({ trace_id: traceId }).update({ deleted_at: trx.fn.now() })
    return true
  })
}

/** Bring a deleted trace and its analyses back; false when it is not deleted. */
export async function restoreTrace(db: Db, traceId: string): Promise<boolean> {
  return db.transaction(async (trx) => {
    const updated = await trx('traces').where({ id: traceId }).whereNotNull('deleted_at').update({ deleted_at: null, deleted_by: null, delete_reason: null })
    if (updated === 0) return false
    await trx('analyses').where({ trace_id: traceId }).update({ deleted_at: null })
    return true
  })
}

/** When a trace was deleted, or null when it is not. */
export async function deletedAtOf(db: Db, traceId: string): Promise<Date | null> {
  const row = (await db('traces').where({ id: traceId }).first('deleted_at')) as { deleted_at: Date | null } | undefined
  return row?.deleted_at ?? null
}

/**
 * Move a trace to another cavity. Its analyses go with it (they keep the geometry they were made with) and are
 * excluded, since they read the trace as the old cavity. Throws PostgreSQL's unique violation when the other
 * cavity already holds the same file.
 */
export async function moveTraceRows(db: Db, traceId: string, toCavityId: string, change: { by: number | null; reason: string }): Promise<void> {
  await db.transaction(async (trx) => {
    await trx('traces').where({ id: traceId }).update({ cavity_id: toCavityId })
    await trx('analyses').where({ trace_id: traceId }).update({ cavity_id: toCavityId })
    await trx('analyses').where({ trace_id: traceId }).whereNull('excluded_at').update({ excluded_at: trx.fn.now(), excluded_by: change.by, exclusion_reason: change.reason })
  })
}

/** Exclude (with a reason) or include again; false when the analysis does not exist or is deleted. */
export async function setExclusion(db: Db, analysisId: string, exclusion: { by: number | null; reason: string } | null): Promise<boolean> {
  const update = exclusion ? { excluded_at: db.fn.now(), excluded_by: exclusion.by, exclusion_reason: exclusion.reason } : { excluded_at: null, excluded_by: null, exclusion_reason: null }
  return (await db('analyses').where({ id: analysisId }).whereNull('deleted_at').update(update)) > 0
}

/** Deleted traces that can still be restored, newest deletion first. */
export async function listDeletedTraces(db: Db, now = new Date()): Promise<DeletedTrace[]> {
  const rows = (await db('traces as t')
    .join('cavities as c', 'c.id', 't.cavity_id')
    .leftJoin('users as u', 'u.id', 't.deleted_by')
    .whereNotNull('t.deleted_at')
    .andWhere('t.deleted_at', '>', new Date(now.getTime() - RESTORE_DAYS * DAY_MS))
    .orderBy('t.deleted_at', 'desc')
    .select('t.id', 't.cavity_id', 'c.name as cavity_name', 't.file_name', 't.uploaded_at', 't.deleted_at', 'u.email as deleted_by_email', 't.delete_reason')) as Array<{
    id: string
    cavity_id: string
    cavity_name: string
    file_name: string
    uploaded_at: Date
    deleted_at: Date
    deleted_by_email: string | null
    delete_reason: string | null
  }>
  return rows.map((row) => ({
    id: row.id,
    cavityId: row.cavity_id,
    cavityName: row.cavity_name,
    fileName: row.file_name,
    uploadedAt: row.uploaded_at.toISOString(),
    deletedAt: row.deleted_at.toISOString(),
    deletedByEmail: row.deleted_by_email,
    reason: row.delete_reason ?? '',
    restoreUntil: new Date(row.deleted_at.getTime() + RESTORE_DAYS * DAY_MS).toISOString(),
  }))
}

/** Remove for good the traces deleted more than the restore window ago (their analyses go by cascade). */
export async function purgeDeletedTraces(db: Db, now = new Date()): Promise<number> {
  return db('traces')
    .whereNotNull('deleted_at')
    .andWhere('deleted_at', '<=', new Date(now.getTime() - RESTORE_DAYS * DAY_MS))
    .delete()
}
