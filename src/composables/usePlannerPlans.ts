/** A cavity's saved mode-matching plans, newest first (`GET /api/cavities/:id/plans`). */
import type { MaybeRefOrGetter } from 'vue'
import { listPlans } from '../api/planner'
import { useCavitraceLoader } from './useCavitraceLoader'

export function usePlannerPlans(cavityId: MaybeRefOrGetter<string | null | undefined>) {
  return useCavitraceLoader(cavityId, (key, signal) => listPlans(key, signal).then((answer) => answer.plans))
}
