/** Data access for the maintenance log: kinds, entries, attached traces, figures around an entry. */
import type { LogEntryQuery, LogEntryTrace, LogFigures, LogKind } from '../../shared/api/logbookSchemas'
import type { Db } from '../db/knex'

export interface LogEntryRecord {
  id: string
  cavityId: string
  cavityName: string
  occurredAt: Date
  authorId: number | null
  authorName: string | null
  kind: string
  kindLabel: string
  text: string
  createdAt: Date
  updatedAt: Date
}

interface EntryRow {
  id: string
  cavity_id: string
  cavity_name: string
  occurred_at: Date
  author_id: number | null
  author_name: string | null
  kind: string
  kind_label: string
  text: string
  created_at: Date
  updated_at: Date
}

function toEntry(row: EntryRow): LogEntryRecord {
  return {
    id: row.id,
    cavityId: row.cavity_id,
    cavityName: row.cavity_name,
    occurredAt: row.occurred_at,
    authorId: row.author_id,
    authorName: row.author_name,
    kind: row.kind,
    kindLabel: row.kind_label,
    text: row.text,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  }
}

function entryQuery(db: Db) {
  return db('log_entries as e')
    .join('cavities as c', 'c.id', 'e.cavity_id')
    .join('log_kinds as k', 'k.key', 'e.kind')
    .leftJoin('users as u', 'u.id', 'e.author_id')
    .select('e.id', 'e.cavity_id', 'c.name as cavity_name', 'e.occurred_at', 'e.author_id', 'u.name as author_name', 'e.kind', 'k.label as kind_label', 'e.text', 'e.created_at', 'e.updated_at')
}

export async function listKinds(db: Db): Promise<LogKind[]> {
  const rows = (await db('log_kinds').orderBy([{ column: 'position' }, { column: 'label' }]).select('key', 'label', 'built_in')) as Array<{ key: string; label: string; built_in: boolean }>
  return rows.map((row) => ({ key: row.key, label: row.label, builtIn: row.built_in }))
}

/** Insert a kind; null when its key or label is taken. */
export async function insertKind(db: Db, kind: { key: string; label: string; createdBy: number | null }): Promise<LogKind | null> {
  const taken = await db('log_kinds').where({ key: kind.key }).orWhereRaw('lower(label) = lower(?)', [kind.label]).first('key')
  if (taken) return null
  const rows = (await db('log_kinds').insert({ key: kind.key, label: kind.label, created_by: kind.createdBy }).onConflict().ignore().returning(['key', 'label', 'built_in'])) as Array<{
    key: string
    label: string
    built_in: boolean
  }>
  return rows[0] ? { key: rows[0].key, label: rows[0].label, builtIn: rows[0].built_in } : null
}

export async function findEntry(db: Db, id: string): Promise<LogEntryRecord | null> {
  const row = (await entryQuery(db).where('e.id', id).first()) as EntryRow | undefined
  return row ? toEntry(row) : null
}

/** Escape LIKE wildcards so a search for "50%" finds the text "50%". */
function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (char) => `\\${char}`)}%`
}

/** Which cavities a list covers: one by id (archived or not), or every cavity, archived ones only when asked. */
export type EntryScope = { cavityId: string } | { includeArchived: boolean }

/**
 * Entries newest first by when the work happened (ties: newest written first, then by id, so pages are
 * stable), at most `limit` (default 200) in all: one query, whatever the number of cavities.
 */
export async function listEntries(db: Db, scope: EntryScope, query: Partial<LogEntryQuery>): Promise<LogEntryRecord[]> {
  const builder = entryQuery(db)
    .orderBy([
      { column: 'e.occurred_at', order: 'desc' },
      { column: 'e.created_at', order: 'desc' },
      { column: 'e.id', order: 'desc' },
    ])
    .limit(query.limit ?? 200)
  if ('cavityId' in scope) builder.where('e.cavity_id', scope.cavityId)
  else if (!scope.includeArchived) builder.where('c.archived', false)
  if (query.q) builder.whereRaw('e.text ilike ?', [likePattern(query.q)])
  if (query.kind && query.kind.length > 0) builder.whereIn('e.kind', query.kind)
  if (query.from) builder.where('e.occurred_at', '>=', query.from)
  if (query.to) builder.where('e.occurred_at', '<=', query.to)
  return ((await builder) as EntryRow[]).map(toEntry)
}

export async function insertEntry(db: Db, entry: { cavityId: string; occurredAt: Date; authorId: number | null; kind: string; text: string }): Promise<string> {
  const [row] = (await db('log_entries')
    .insert({ cavity_id: entry.cavityId, occurred_at: entry.occurredAt, author_id: entry.authorId, kind: entry.kind, text: entry.text })
    .returning('id')) as Array<{ id: string }>
  return row.id
}

export async function updateEntry(db: Db, id: string, patch: { occurredAt?: Date; kind?: string; text?: string }): Promise<void> {
  const row: Record<string, unknown> = { updated_at: db.fn.now() }
  if (patch.occurredAt !== undefined) row.occurred_at = patch.occurredAt
  if (patch.kind !== undefined) row.kind = patch.kind
  if (patch.text !== undefined) row.text = patch.text
  await db('log_entries').where({ id }).update(row)
}

export async function deleteEntry(db: Db, id: string): Promise<void> {
  await db('log_entries').where({ id }).delete()
}

/** Of `traceIds`, those stored for `cavityId`. */
export async function traceIdsOfCavity(db: Db, cavityId: string, traceIds: string[]): Promise<Set<string>> {
  if (traceIds.length === 0) return new Set()
  const rows = (await db('traces').where({ cavity_id: cavityId }).whereIn('id', traceIds).select('id')) as Array<{ id: string }>
  return new Set(rows.map((row) => row.id))
}

export async function linkTraces(db: Db, entryId: string, traceIds: string[]): Promise<void> {
  if (traceIds.length === 0) return
  await db('log_entry_traces')
    .insert(traceIds.map((traceId) => ({ entry_id: entryId, trace_id: traceId })))
    .onConflict(['entry_id', 'trace_id'])
    .ignore()
}

export async function replaceLinkedTraces(db: Db, entryId: string, traceIds: string[]): Promise<void> {
  await db.transaction(async (trx) => {
    await trx('log_entry_traces').where({ entry_id: entryId }).whereNotIn('trace_id', traceIds).delete()
    await linkTraces(trx, entryId, traceIds)
  })
}

/** The attached traces of each entry, with each trace's latest analysis. */
export async function tracesOfEntries(db: Db, entryIds: string[]): Promise<Map<string, LogEntryTrace[]>> {
  const byEntry = new Map<string, LogEntryTrace[]>()
  if (entryIds.length === 0) return byEntry
  const rows = (await db('log_entry_traces as l')
    .join('traces as t', 't.id', 'l.trace_id')
    .joinRaw(
      `left join lateral (select a.id, a.status, a.fundamental_fraction from analyses a where a.trace_id = t.id order by a.created_at desc limit 1) as a on true`,
    )
    .whereIn('l.entry_id', entryIds)
    .orderBy('t.uploaded_at')
    .select('l.entry_id', 't.id', 't.file_name', 't.note', 't.uploaded_at', 'a.id as analysis_id', 'a.status as analysis_status', 'a.fundamental_fraction')) as Array<{
    entry_id: string
    id: string
    file_name: string
    note: string
    uploaded_at: Date
    analysis_id: string | null
    analysis_status: string | null
    fundamental_fraction: number | null
  }>
  for (const row of rows) {
    const list = byEntry.get(row.entry_id) ?? []
    list.push({
      id: row.id,
      fileName: row.file_name,
      note: row.note,
      uploadedAt: row.uploaded_at.toISOString(),
      analysis: row.analysis_id ? { id: row.analysis_id, status: row.analysis_status ?? 'queued', fundamentalFraction: row.fundamental_fraction } : null,
    })
    byEntry.set(row.entry_id, list)
  }
  return byEntry
}

/** For each entry, the nearest done analysis of its cavity strictly before and strictly after its date. */
export async function figuresAroundEntries(db: Db, entryIds: string[]): Promise<Map<string, { before: LogFigures | null; after: LogFigures | null }>> {
  const around = new Map<string, { before: LogFigures | null; after: LogFigures | null }>()
  if (entryIds.length === 0) return around
  const side = (direction: 'before' | 'after') =>
    `left join lateral (select a.id, a.created_at, a.fundamental_fraction, a.finesse, a.linewidth_hz from analyses a
       where a.cavity_id = e.cavity_id and a.status = 'done' and a.created_at ${direction === 'before' ? '<' : '>'} e.occurred_at
       order by a.created_at ${direction === 'before' ? 'desc' : 'asc'} limit 1) as ${direction === 'before' ? 'b' : 'f'} on true`
  const rows = (await db('log_entries as e')
    .joinRaw(side('before'))
    .joinRaw(side('after'))
    .whereIn('e.id', entryIds)
    .select(
      'e.id',
      'b.id as b_id',
      'b.created_at as b_at',
      'b.fundamental_fraction as b_fraction',
      'b.finesse as b_finesse',
      'b.linewidth_hz as b_linewidth',
      'f.id as f_id',
      'f.created_at as f_at',
      'f.fundamental_fraction as f_fraction',
      'f.finesse as f_finesse',
      'f.linewidth_hz as f_linewidth',
    )) as Array<Record<string, unknown>>
  const figures = (row: Record<string, unknown>, prefix: 'b' | 'f'): LogFigures | null =>
    row[`${prefix}_id`]
      ? {
          analysisId: row[`${prefix}_id`] as string,
          createdAt: (row[`${prefix}_at`] as Date).toISOString(),
          fundamentalFraction: row[`${prefix}_fraction`] as number | null,
          finesse: row[`${prefix}_finesse`] as number | null,
          linewidthHz: row[`${prefix}_linewidth`] as number | null,
        }
      : null
  for (const row of rows) around.set(row.id as string, { before: figures(row, 'b'), after: figures(row, 'f') })
  return around
}

/** The newest entry of each cavity (for the overview). */
export async function latestEntryPerCavity(db: Db): Promise<Map<string, { entryId: string; occurredAt: string; kind: string; kindLabel: string }>> {
  const rows = (await db('log_entries as e')
    .join('log_kinds as k', 'k.key', 'e.kind')
    .distinctOn('e.cavity_id')
    .orderBy([{ column: 'e.cavity_id' }, { column: 'e.occurred_at', order: 'desc' }])
    .select('e.cavity_id', 'e.id', 'e.occurred_at', 'e.kind', 'k.label')) as Array<{ cavity_id: string; id: string; occurred_at: Date; kind: string; label: string }>
  return new Map(rows.map((row) => [row.cavity_id, { entryId: row.id, occurredAt: row.occurred_at.toISOString(), kind: row.kind, kindLabel: row.label }]))
}

/** Entries of every cavity in a time window, oldest first (for the weekly digest). */
export async function entriesBetween(db: Db, from: Date, to: Date): Promise<Array<LogEntryRecord>> {
  const rows = (await entryQuery(db).where('e.occurred_at', '>=', from).andWhere('e.occurred_at', '<', to).orderBy('e.occurred_at')) as EntryRow[]
  return rows.map(toEntry)
}
