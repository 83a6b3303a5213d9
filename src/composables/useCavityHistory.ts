/** A cavity's analyses, newest first (`GET /api/cavities/:id/history`). */
import type { MaybeRefOrGetter } from 'vue'
import { getCavityHistory } from '../api/cavities'
import { useCavitraceLoader } from './useCavitraceLoader'

export function useCavityHistory(id: MaybeRefOrGetter<string | null | undefined>, options: { limit?: number } = {}) {
  const { limit = 200 } = options
  return useCavitraceLoader(id, (key, signal) => getCavityHistory(key, { limit }, signal).then((answer) => answer.analyses))
}
