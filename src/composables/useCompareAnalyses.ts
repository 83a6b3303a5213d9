/**
 * Two analyses side by side: the server's comparison (figures and b − a), each analysis's full result
 * (peaks and sweep, for the overlay) and each raw trace read in the browser.
 */
import { computed, toValue, type MaybeRefOrGetter } from 'vue'
import { getAnalysis } from '../api/cavities'
import { compareAnalyses } from '../api/history'
import { useCavitraceLoader } from './useCavitraceLoader'
import { useTraceFile } from './useTraceFile'

export function useCompareAnalyses(a: MaybeRefOrGetter<string | null | undefined>, b: MaybeRefOrGetter<string | null | undefined>) {
  const pair = computed(() => {
    const first = toValue(a)
    const second = toValue(b)
    return first && second ? `${first}|${second}` : null
  })
  const comparison = useCavitraceLoader(pair, (key, signal) => {
    const [first, second] = key.split('|')
    return compareAnalyses(first, second, signal)
  })
  const analysisA = useCavitraceLoader(a, (key, signal) => getAnalysis(key, signal))
  const analysisB = useCavitraceLoader(b, (key, signal) => getAnalysis(key, signal))
  const traceA = useTraceFile(() => analysisA.data.value?.traceId ?? null)
  const traceB = useTraceFile(() => analysisB.data.value?.traceId ?? null)
  return { comparison, analysisA, analysisB, traceA, traceB }
}
