/** A stored trace's record and the list of its analyses (`GET /api/traces/:id`). */
import type { MaybeRefOrGetter } from 'vue'
import { getTrace } from '../api/cavities'
import { useCavitraceLoader } from './useCavitraceLoader'

export function useTraceRecord(traceId: MaybeRefOrGetter<string | null | undefined>) {
  return useCavitraceLoader(traceId, (key, signal) => getTrace(key, signal))
}
