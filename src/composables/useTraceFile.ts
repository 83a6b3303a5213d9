/**
 * A stored trace read in the browser: download the raw export and run the engine's own reader on it, so
 * the chart shows exactly the samples the analysis saw. The typed arrays are held in a shallow ref. An export
 * without a time axis is read with `sampleIntervalSeconds` (the analysis's option or the cavity's remembered one).
 */
import { toValue, type MaybeRefOrGetter } from 'vue'
import { readTrace } from '../../shared/trace/readTrace'
import type { Trace } from '../../shared/trace/types'
import { downloadTraceBytes } from '../api/cavities'
import { ApiError } from '../api/client'
import { useCavitraceLoader } from './useCavitraceLoader'

export function useTraceFile(traceId: MaybeRefOrGetter<string | null | undefined>, sampleIntervalSeconds: MaybeRefOrGetter<number | null | undefined> = null) {
  // The interval is part of the key, so a trace that failed for want of it is read again once it is known.
  const key = () => {
    const id = toValue(traceId)
    return id ? `${id} ${toValue(sampleIntervalSeconds) ?? ''}` : null
  }
  return useCavitraceLoader<Trace>(key, async (composite, signal) => {
    const [id, given] = composite.split(' ')
    const interval = given ? Number(given) : null
    const bytes = await downloadTraceBytes(id, signal)
    try {
      try {
        return readTrace(bytes)
      } catch (caught) {
        if ((caught as { code?: string }).code !== 'no_sample_interval' || !interval) throw caught
        return readTrace(bytes, { sampleIntervalSeconds: interval })
      }
    } catch (caught) {
      const code = (caught as { code?: string }).code ?? 'unreadable_trace'
      throw new ApiError(0, code, caught instanceof Error ? caught.message : String(caught))
    }
  })
}
