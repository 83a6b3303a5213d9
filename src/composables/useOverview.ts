/**
 * The leads' overview (`GET /api/overview`), refreshed quietly every minute so new analyses and breaches
 * show on a screen left open, and watching or unwatching a cavity from it.
 */
import { onScopeDispose, shallowRef } from 'vue'
import { getOverview, type Overview } from '../api/history'
import { setWatching } from '../api/alerts'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useOverview(options: { refreshMs?: number } = {}) {
  const { refreshMs = 60_000 } = options
  const resource = useCavitraceLoader<Overview>('overview', (_key, signal) => getOverview(signal))
  const timer = setInterval(() => void resource.reload({ quiet: true }), refreshMs)
  onScopeDispose(() => clearInterval(timer))
  /** Whether a watch change is in flight. */
  const watchBusy = shallowRef(false)

  /** Watch or unwatch one cavity; the row is updated in place from the answer. */
  async function toggleWatch(cavityId: string, watching: boolean): Promise<{ watching: boolean } | { error: ApiError }> {
    return runAction(watchBusy, async () => {
      const answer = await setWatching(cavityId, watching)
      const current = resource.data.value
      if (current) resource.data.value = { ...current, cavities: current.cavities.map((row) => (row.cavityId === cavityId ? { ...row, watchedByMe: answer.watching } : row)) }
      return { watching: answer.watching }
    })
  }

  return { ...resource, watchBusy, toggleWatch }
}
