/**
 * Maintenance-log entries of one or several cavities with the same filters, merged newest first (the API
 * lists one cavity at a time), and writing entries: create (with linked and uploaded traces), edit, delete.
 */
import { computed, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { createLogEntry, deleteLogEntry, editLogEntry, listLogEntries, uploadEntryTraces, type LogEntry, type LogEntryDraft, type LogEntryFilter } from '../api/logbook'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

/** Entries of several lists in one, newest first by when the work happened (ties: newest written first). */
export function mergeLogEntries(lists: readonly (readonly LogEntry[])[]): LogEntry[] {
  return lists.flat().sort((a, b) => Date.parse(b.occurredAt) - Date.parse(a.occurredAt) || Date.parse(b.createdAt) - Date.parse(a.createdAt))
}

export function useLogEntries(cavityIds: MaybeRefOrGetter<readonly string[]>, filter: MaybeRefOrGetter<LogEntryFilter> = {}) {
  const key = computed(() => {
    const ids = toValue(cavityIds)
    return ids.length ? JSON.stringify({ ids, filter: toValue(filter) }) : null
  })
  const resource = useCavitraceLoader<LogEntry[]>(key, async (composite, signal) => {
    const { ids, filter: current } = JSON.parse(composite) as { ids: string[]; filter: LogEntryFilter }
    const answers = await Promise.all(ids.map((id) => listLogEntries(id, current, signal)))
    return mergeLogEntries(answers.map((answer) => answer.entries))
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
