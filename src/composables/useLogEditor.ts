/**
 * The write side of a maintenance-log list, shared by the logbook page and the cavity page's panel: who
 * may write, change or delete which entry (the server's rule: the author, or anyone who manages the lab),
 * and the state of the entry dialog.
 */
import { formatDate } from '../components/time/formatTime'
import { shallowRef } from 'vue'
import type { LogEntry } from '../api/logbook'
import type { LogEntrySubmission } from '../components/logbook/LogEntryDialog.vue'
import { useSessionStore } from '../stores/session'
import type { useLogEntries } from './useLogEntries'

export function useLogEditor(entries: ReturnType<typeof useLogEntries>) {
  const session = useSessionStore()
  /** Whether the dialog is open, and for which entry (null: a new one). */
  const dialogOpen = shallowRef(false)
  const editing = shallowRef<LogEntry | null>(null)
  const serverError = shallowRef<string | null>(null)
  /** The last entry written, so a page can point at it. */
  const lastSaved = shallowRef<LogEntry | null>(null)

  const canWrite = () => session.can('logbook.write')
  const canEdit = (entry: LogEntry) => canWrite() && (entry.author?.id === session.user?.id || session.can('cavities.write'))

  function openNew() {
    editing.value = null
    serverError.value = null
    dialogOpen.value = true
  }
  /** For the dialog's own close button. */
  function setDialogOpen(open: boolean) {
    dialogOpen.value = open
  }
  function openEdit(entry: LogEntry) {
    editing.value = entry
    serverError.value = null
    dialogOpen.value = true
  }

  async function save({ cavityId, draft, files }: LogEntrySubmission): Promise<void> {
    serverError.value = null
    const outcome = editing.value ? await entries.edit(editing.value.id, draft, files) : await entries.create(cavityId, draft, files)
    if ('error' in outcome) {
      serverError.value = outcome.error.message
      return
    }
    lastSaved.value = outcome.entry
    dialogOpen.value = false
  }

  async function remove(entry: LogEntry): Promise<string | null> {
    if (!window.confirm(`Delete the ${entry.kindLabel.toLowerCase()} entry of ${formatDate(entry.occurredAt)}? Its traces stay stored.`)) return null
    const outcome = await entries.remove(entry.id)
    return 'error' in outcome ? outcome.error.message : null
  }

  return { dialogOpen, editing, serverError, lastSaved, canWrite, canEdit, openNew, openEdit, setDialogOpen, save, remove }
}
