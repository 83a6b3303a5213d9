/**
 * The tuning session of one cavity: its recent analyses (history + live events), the newest finished
 * result in full, the change from the previous trace, and the trend of this session in upload order.
 * "Session" = the newest run of uploads with no pause over 30 minutes.
 */
import { computed, onScopeDispose, type MaybeRefOrGetter } from 'vue'
import { getAnalysis } from '../api/cavities'
import { finishedEntries, fractionChange, sessionEntries } from '../components/tuning/tuningSession'
import { useCavityEvents } from './useCavityEvents'
import { useCavityHistory } from './useCavityHistory'
import { useCavitraceLoader } from './useCavitraceLoader'

export interface TuningSessionOptions {
  /** A pause longer than this between uploads starts a new session. @default 30 */
  gapMinutes?: number
}

export function useCavityTuningSession(cavityId: MaybeRefOrGetter<string | null | undefined>, options: TuningSessionOptions = {}) {
  const { gapMinutes = 30 } = options
  const history = useCavityHistory(cavityId, { limit: 100 })

  /** The session's analyses, oldest first, whatever their status. */
  const entries = computed(() => sessionEntries(history.data.value ?? [], { gapMinutes }))
  const finished = computed(() => finishedEntries(entries.value))
  /** The newest analysis of the session (it may still be queued or running). */
  const newest = computed(() => entries.value[entries.value.length - 1] ?? null)
  const latestDone = computed(() => finished.value[finished.value.length - 1] ?? null)
  const previousDone = computed(() => finished.value[finished.value.length - 2] ?? null)
  const change = computed(() =>
    fractionChange(latestDone.value?.fundamentalFraction ?? null, previousDone.value?.fundamentalFraction ?? null, {
      latest: latestDone.value?.fundamentalFractionError,
      previous: previousDone.value?.fundamentalFractionError,
    }),
  )
  /** The newest finished analysis in full: shares, reading, warnings. */
  const latest = useCavitraceLoader(() => latestDone.value?.analysisId, (key, signal) => getAnalysis(key, signal))

  // Several events arrive close together (queued → running → done, several files): refresh once per burst.
  let pending: ReturnType<typeof setTimeout> | undefined
  function refreshSoon(delayMs = 80) {
    clearTimeout(pending)
    pending = setTimeout(() => void history.reload({ quiet: true }), delayMs)
  }
  const { connected } = useCavityEvents(cavityId, () => refreshSoon())
  onScopeDispose(() => clearTimeout(pending))

  return { history, entries, finished, newest, latestDone, previousDone, change, latest, connected, refresh: refreshSoon }
}
