/**
 * What the history page draws for one cavity and date range: its analyses in the range (newest first,
 * as the API answers) and its maintenance-log entries in the same range, loaded together.
 */
import { computed, toValue, type MaybeRefOrGetter } from 'vue'
import { getCavityHistory, type CavityHistoryRow } from '../api/cavities'
import { listLogEntries, type LogEntry } from '../api/logbook'
import { useCavitraceLoader } from './useCavitraceLoader'

export interface HistoryTrend {
  rows: CavityHistoryRow[]
  entries: LogEntry[]
}

/** `to` may be left open (the rolling presets), so analyses finished after the page opened still come in on reload. */
export function useHistoryTrend(cavityId: MaybeRefOrGetter<string | null | undefined>, range: MaybeRefOrGetter<{ from: string; to?: string }>, options: { limit?: number } = {}) {
  const { limit = 5000 } = options
  // One key per cavity and range, so a new range aborts the old request and loads again.
  const key = computed(() => {
    const id = toValue(cavityId)
    if (!id) return null
    const { from, to } = toValue(range)
    return JSON.stringify([id, from, to ?? null])
  })
  return useCavitraceLoader<HistoryTrend>(key, async (composite, signal) => {
    const [id, from, openTo] = JSON.parse(composite) as [string, string, string | null]
    const to = openTo ?? undefined
    const [history, log] = await Promise.all([getCavityHistory(id, { from, to, limit }, signal), listLogEntries(id, { from, to, limit: 1000 }, signal)])
    return { rows: history.analyses, entries: log.entries }
  })
}
