/**
 * Maintenance-log entries of one cavity, or of the whole lab in one request (`GET /api/log-entries`),
 * with filters, and writing entries: create (with linked and uploaded traces), edit, delete.
 */
import { computed, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { createLogEntry, deleteLogEntry, editLogEntry, listLabLogEntries, listLogEntries, uploadEntryTraces, type LogEntry, type LogEntryDraft, type LogEntryFilter } from '../api/logbook'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

/**
 * The entries of cavity `cavityId`, or of every active cavity of the lab when it is null (one request
 * either way); `filter.limit` then counts the whole list.
 */
export function useLogEntries(cavityId: MaybeRefOrGetter<string | null>, filter: MaybeRefOrGetter<LogEntryFilter> = {}) {
  const key = computed(() => JSON.stringify({ cavityId: toValue(cavityId) || null, filter: toValue(filter) }))
  const resource = useCavitraceLoader<LogEntry[]>(key, async (composite, signal) => {
    const { cavityId: id, filter: current } = JSON.parse(composite) as { cavityId: string | null; filter: LogEntryFilter }
    const answer = id === null ? await listLabLogEntries(current, signal) : await listLogEntries(id, current, signal)
    return answer.entries
  })
  /** Whether a write is in flight. */
  const saving = shallowRef(false)

  /** Create an entry, then upload `files` into it (each analysed like any upload); reloads the list. */
  async function create(cavityId: string, draft: LogEntryDraft, files: File[] = []): Promise<{ entry: LogEntry } | { error: ApiError }> {
    return runAction(saving, async () => {
      let { entry } = await createLogEntry(cavityId, draft)
      if (files.length) entry = (await uploadEntryTraces(entry.id, files)).entry
      await resource.reload({ quiet: true })
      return { entry }
    })
  }

  /** Edit an entry (and upload more files into it); reloads the list. */
  async function edit(id: string, patch: Partial<LogEntryDraft>, files: File[] = []): Promise<{ entry: LogEntry } | { error: ApiError }> {
    return runAction(saving, async () => {
      let { entry } = await editLogEntry(id, patch)
      if (files.length) entry = (await uploadEntryTraces(entry.id, files)).entry
      await resource.reload({ quiet: true })
      return { entry }
    })
  }

  async function remove(id: string): Promise<{ removed: true } | { error: ApiError }> {
    return runAction(saving, async () => {
      await deleteLogEntry(id)
      await resource.reload({ quiet: true })
      return { removed: true as const }
    })
  }

  return { ...resource, saving, create, edit, remove }
}
