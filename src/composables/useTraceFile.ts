/**
 * A stored trace read in the browser: download the raw export and run the engine's own reader on it, so
 * the chart shows exactly the samples the analysis saw. The typed arrays are held in a shallow ref.
 */
import type { MaybeRefOrGetter } from 'vue'
import { readTrace } from '../../shared/trace/readTrace'
import type { Trace } from '../../shared/trace/types'
import { downloadTraceBytes } from '../api/cavities'
import { ApiError } from '../api/client'
import { useCavitraceLoader } from './useCavitraceLoader'

export function useTraceFile(traceId: MaybeRefOrGetter<string | null | undefined>) {
  return useCavitraceLoader<Trace>(traceId, async (key, signal) => {
    const bytes = await downloadTraceBytes(key, signal)
    try {
      return readTrace(bytes)
    } catch (caught) {
      const code = (caught as { code?: string }).code ?? 'unreadable_trace'
      throw new ApiError(0, code, caught instanceof Error ? caught.message : String(caught))
    }
  })
}
