/**
 * One analysis (`GET /api/analyses/:id`), kept current while it is queued or running: the cavity's event
 * stream says when it changes, and a slow poll covers a stream that is down. `rerun(options)` asks for a
 * new analysis of the same trace (the old one is kept).
 */
import { computed, onScopeDispose, shallowRef, toValue, watch, type MaybeRefOrGetter } from 'vue'
import { getAnalysis, requestAnalysis, type AnalysisOptions, type AnalysisRecord } from '../api/cavities'
import type { ApiError } from '../api/client'
import { useCavityEvents } from './useCavityEvents'
import { asApiError, runAction, useCavitraceLoader } from './useCavitraceLoader'

export interface UseAnalysisOptions {
  /** Poll interval while the analysis is unfinished, ms. @default 3000 */
  pollMs?: number
}

export function useAnalysis(id: MaybeRefOrGetter<string | null | undefined>, options: UseAnalysisOptions = {}) {
  const { pollMs = 3000 } = options
  const resource = useCavitraceLoader(id, (key, signal) => getAnalysis(key, signal))
  const unfinished = computed(() => resource.data.value?.status === 'queued' || resource.data.value?.status === 'running')
  /** Whether a re-analysis request is in flight. */
  const requesting = shallowRef(false)

  useCavityEvents(
    () => resource.data.value?.cavityId,
    (event) => {
      if (event.analysisId === toValue(id) && event.status !== resource.data.value?.status) void resource.reload({ quiet: true })
    },
  )

  let timer: ReturnType<typeof setInterval> | undefined
  watch(
    unfinished,
    (waiting) => {
      clearInterval(timer)
      timer = waiting ? setInterval(() => void resource.reload({ quiet: true }), pollMs) : undefined
    },
    { immediate: true },
  )
  onScopeDispose(() => clearInterval(timer))

  /** Queue a new analysis of this analysis's trace with `analysisOptions`. */
  async function rerun(analysisOptions: AnalysisOptions): Promise<{ analysis: AnalysisRecord } | { error: ApiError }> {
    const traceId = resource.data.value?.traceId
    if (!traceId) return { error: asApiError(new Error('The analysis is not loaded yet.')) }
    return runAction(requesting, () => requestAnalysis(traceId, analysisOptions))
  }

  return { ...resource, unfinished, requesting, rerun }
}
