/**
 * Maintenance-log use cases: kinds, entries with their attached traces and the figures of the nearest
 * analyses around them. Technicians, leads and admins write (the route checks `logbook.write`); an
 * entry may then be changed by its author, or by anyone who manages the lab (`cavities.write`).
 */
import { can } from '../../shared/auth/permissions'
import type { BeforeAfter, LabLogEntryQuery, LogEntry, LogEntryInput, LogEntryPatch, LogEntryQuery, LogKind, LogKindInput } from '../../shared/api/logbookSchemas'
import type { Actor } from '../auth/actor'
import { getCavity } from '../cavities/cavityService'
import type { Db } from '../db/knex'
import { HttpError } from '../http/errors'
import { uploadTraces, type UploadContext, type UploadedFile, type UploadOutcome } from '../traces/traceService'
import {
  deleteEntry,
  figuresAroundEntries,
  findEntry,
  insertEntry,
  insertKind,
  linkTraces,
  listEntries,
  listKinds,
  replaceLinkedTraces,
  traceIdsOfCavity,
  tracesOfEntries,
  updateEntry,
  type LogEntryRecord,
} from './logbookRepository'

/** The table has no separate "moderate the log" action; those who manage the cavities correct entries. */
const moderatorAction = 'cavities.write' as const

export { listKinds as listLogKinds }

/** `Mirror change` → `mirror_change`. */
export function kindKeyOf(label: string): string {
  return label
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 60)
}

export async function addLogKind(db: Db, input: LogKindInput, actor: Actor): Promise<LogKind> {
  const key = kindKeyOf(input.label)
  if (!key) throw new HttpError(400, 'invalid_input', 'label: must contain letters or digits')
  const kind = await insertKind(db, { key, label: input.label, createdBy: actor.id })
  if (!kind) throw new HttpError(409, 'kind_exists', `A log kind named "${input.label}" already exists.`)
  return kind
}

function difference(after: number | null | undefined, before: number | null | undefined): number | null {
  return after === null || after === undefined || before === null || before === undefined ? null : after - before
}

async function toLogEntries(db: Db, records: LogEntryRecord[]): Promise<LogEntry[]> {
  const ids = records.map((record) => record.id)
  const [traces, around] = await Promise.all([tracesOfEntries(db, ids), figuresAroundEntries(db, ids)])
  return records.map((record) => {
    const { before = null, after = null } = around.get(record.id) ?? {}
    const beforeAfter: BeforeAfter = {
      before,
      after,
      change: {
        fundamentalFraction: difference(after?.fundamentalFraction, before?.fundamentalFraction),
        finesse: difference(after?.finesse, before?.finesse),
        linewidthHz: difference(after?.linewidthHz, before?.linewidthHz),
      },
    }
    return {
      id: record.id,
      cavityId: record.cavityId,
      cavityName: record.cavityName,
      occurredAt: record.occurredAt.toISOString(),
      author: record.authorId === null ? null : { id: record.authorId, name: record.authorName ?? '' },
      kind: record.kind,
      kindLabel: record.kindLabel,
      text: record.text,
      traces: traces.get(record.id) ?? [],
      beforeAfter,
      createdAt: record.createdAt.toISOString(),
      updatedAt: record.updatedAt.toISOString(),
    }
  })
}

async function requireEntry(db: Db, id: string): Promise<LogEntryRecord> {
  const entry = await findEntry(db, id)
  if (!entry) throw new HttpError(404, 'log_entry_not_found', `No log entry with id ${id}.`)
  return entry
}

function requireMayChange(entry: LogEntryRecord, actor: Actor): void {
  if (entry.authorId === actor.id || can(actor.role, moderatorAction)) return
  throw new HttpError(403, 'not_author', 'Only the author of this log entry, a lead or an admin may change it.')
}

async function requireKind(db: Db, key: string): Promise<void> {
  const kinds = await listKinds(db)
  if (!kinds.some((kind) => kind.key === key)) {
    throw new HttpError(400, 'unknown_kind', `kind: "${key}" is not a log kind (one of ${kinds.map((kind) => kind.key).join(', ')}).`)
  }
}

async function requireTracesOfCavity(db: Db, cavityId: string, traceIds: string[]): Promise<string[]> {
  const unique = [...new Set(traceIds)]
  const found = await traceIdsOfCavity(db, cavityId, unique)
  const missing = unique.filter((id) => !found.has(id))
  if (missing.length > 0) throw new HttpError(422, 'trace_not_of_cavity', `These traces are not stored for this cavity: ${missing.join(', ')}.`)
  return unique
}

export async function listLogEntries(db: Db, cavityId: string, query: LogEntryQuery): Promise<LogEntry[]> {
  const cavity = await getCavity(db, cavityId)
  return toLogEntries(db, await listEntries(db, { cavityId: cavity.id }, query))
}

/**
 * Entries of the whole lab in one list (one query, then the traces and figures of all of them in one
 * batch each): every active cavity, archived ones too when asked, or the one cavity `cavityId` names.
 */
export async function listLabLogEntries(db: Db, query: LabLogEntryQuery): Promise<LogEntry[]> {
  const { cavityId, archived, ...filters } = query
  const scope = cavityId === undefined ? { includeArchived: archived } : { cavityId: (await getCavity(db, cavityId)).id }
  return toLogEntries(db, await listEntries(db, scope, filters))
}

export async function getLogEntry(db: Db, id: string): Promise<LogEntry> {
  const [entry] = await toLogEntries(db, [await requireEntry(db, id)])
  return entry
}

export async function createLogEntry(db: Db, cavityId: string, input: LogEntryInput, actor: Actor): Promise<LogEntry> {
  const cavity = await getCavity(db, cavityId)
  await requireKind(db, input.kind)
  const traceIds = await requireTracesOfCavity(db, cavity.id, input.traceIds)
  const id = await db.transaction(async (trx) => {
    const entryId = await insertEntry(trx, { cavityId: cavity.id, occurredAt: input.occurredAt ?? new Date(), authorId: actor.id, kind: input.kind, text: input.text })
    await linkTraces(trx, entryId, traceIds)
    return entryId
  })
  return getLogEntry(db, id)
}

export async function editLogEntry(db: Db, id: string, patch: LogEntryPatch, actor: Actor): Promise<LogEntry> {
  const entry = await requireEntry(db, id)
  requireMayChange(entry, actor)
  if (patch.kind !== undefined) await requireKind(db, patch.kind)
  if (patch.traceIds !== undefined) await replaceLinkedTraces(db, id, await requireTracesOfCavity(db, entry.cavityId, patch.traceIds))
  await updateEntry(db, id, patch)
  return getLogEntry(db, id)
}

export async function removeLogEntry(db: Db, id: string, actor: Actor): Promise<void> {
  const entry = await requireEntry(db, id)
  requireMayChange(entry, actor)
  await deleteEntry(db, id)
}

/** Upload files from an entry: stored and analysed as any upload of its cavity, then attached. */
export async function uploadEntryTraces(context: UploadContext, id: string, files: UploadedFile[], note: string, actor: Actor): Promise<{ entry: LogEntry; uploads: UploadOutcome[] }> {
  const entry = await requireEntry(context.db, id)
  requireMayChange(entry, actor)
  const uploads = await uploadTraces(context, entry.cavityId, files, note || `${entry.kindLabel} (log entry)`, actor.id)
  await linkTraces(
    context.db,
    id,
    uploads.map((upload) => upload.trace.id),
  )
  return { entry: await getLogEntry(context.db, id), uploads }
}
