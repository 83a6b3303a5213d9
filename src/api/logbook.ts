/**
 * Typed calls for the maintenance log: kinds of entry, a cavity's or the whole lab's entries with search
 * and filters, one entry, writing and deleting entries, and uploading new traces into an entry (multipart).
 */
import type { BeforeAfter, LogEntry, LogEntryTrace, LogFigures, LogKind } from '../../shared/api/logbookSchemas'
import type { UploadOutcome } from '../../shared/api/tuningTypes'
import { apiRequest } from './client'

export type { BeforeAfter, LogEntry, LogEntryTrace, LogFigures, LogKind }

const enc = encodeURIComponent

/** Filters of `GET /api/cavities/:id/log-entries` and `GET /api/log-entries`; dates are ISO 8601, `kinds` are kind keys. */
export interface LogEntryFilter {
  q?: string
  kinds?: string[]
  from?: string
  to?: string
  limit?: number
}

/** What the entry form sends; `occurredAt` ISO 8601. */
export interface LogEntryDraft {
  occurredAt?: string
  kind: string
  text?: string
  traceIds?: string[]
}

export function listLogKinds(signal?: AbortSignal): Promise<{ kinds: LogKind[] }> {
  return apiRequest('/log-kinds', { signal })
}

export function addLogKind(label: string): Promise<{ kind: LogKind }> {
  return apiRequest('/log-kinds', { method: 'POST', body: { label } })
}

/** What the lab-wide list adds: one cavity by id, and whether archived cavities count. */
export interface LabLogEntryFilter extends LogEntryFilter {
  cavityId?: string
  archived?: boolean
}

function filterSearch(filter: LabLogEntryFilter): string {
  const params = new URLSearchParams()
  if (filter.q?.trim()) params.set('q', filter.q.trim())
  if (filter.kinds?.length) params.set('kind', filter.kinds.join(','))
  if (filter.from) params.set('from', filter.from)
  if (filter.to) params.set('to', filter.to)
  if (filter.limit !== undefined) params.set('limit', String(filter.limit))
  if (filter.cavityId) params.set('cavityId', filter.cavityId)
  if (filter.archived) params.set('archived', 'true')
  const search = params.toString()
  return search ? `?${search}` : ''
}

export function listLogEntries(cavityId: string, filter: LogEntryFilter = {}, signal?: AbortSignal): Promise<{ cavityId: string; entries: LogEntry[] }> {
  const { q, kinds, from, to, limit } = filter
  return apiRequest(`/cavities/${enc(cavityId)}/log-entries${filterSearch({ q, kinds, from, to, limit })}`, { signal })
}

/** The whole lab's entries in one request, newest first; `limit` counts the whole list, not per cavity. */
export function listLabLogEntries(filter: LabLogEntryFilter = {}, signal?: AbortSignal): Promise<{ entries: LogEntry[] }> {
  return apiRequest(`/log-entries${filterSearch(filter)}`, { signal })
}

export function getLogEntry(id: string, signal?: AbortSignal): Promise<{ entry: LogEntry }> {
  return apiRequest(`/log-entries/${enc(id)}`, { signal })
}

export function createLogEntry(cavityId: string, draft: LogEntryDraft): Promise<{ entry: LogEntry }> {
  return apiRequest(`/cavities/${enc(cavityId)}/log-entries`, { method: 'POST', body: draft })
}

/** Edit an entry; `traceIds`, when given, replaces its linked traces. */
export function editLogEntry(id: string, patch: Partial<LogEntryDraft>): Promise<{ entry: LogEntry }> {
  return apiRequest(`/log-entries/${enc(id)}`, { method: 'PATCH', body: patch })
}

/** Delete an entry (its traces stay stored). */
export function deleteLogEntry(id: string): Promise<null> {
  return apiRequest(`/log-entries/${enc(id)}`, { method: 'DELETE' })
}

/** Upload new trace files into an entry (multipart field `file`); each is stored for the cavity and analysed. */
export function uploadEntryTraces(entryId: string, files: File[], note = ''): Promise<{ entry: LogEntry; uploads: UploadOutcome[] }> {
  const form = new FormData()
  for (const file of files) form.append('file', file, file.name)
  if (note.trim()) form.append('note', note.trim())
  return apiRequest(`/log-entries/${enc(entryId)}/traces`, { method: 'POST', body: form })
}
