/**
 * One saved plan with its pictures (`GET /api/plans/:id`), deleting it, and what the cavity's newest finished scan
 * says about its mode-match (the order-2 share as waist errors, and how moving each lens of this plan changes it).
 */
import { computed, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { getCavityHistory } from '../api/cavities'
import { deletePlan, getMismatchFamily, getPlan } from '../api/planner'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function usePlannerPlan(planId: MaybeRefOrGetter<string | null | undefined>) {
  const resource = useCavitraceLoader(planId, (key, signal) => getPlan(key, signal).then((answer) => answer.plan))
  const cavityKey = computed(() => (resource.data.value ? `${resource.data.value.cavityId}/${resource.data.value.id}` : null))
  /** Null when the cavity has no finished analysis yet. */
  const mismatch = useCavitraceLoader(cavityKey, async (key, signal) => {
    const [cavityId, id] = key.split('/')
    const history = await getCavityHistory(cavityId, { limit: 50 }, signal)
    const latest = history.analyses.find((row) => row.status === 'done')
    return latest ? getMismatchFamily(latest.analysisId, id, signal) : null
  })
  const deleting = shallowRef(false)

  /** Delete this plan (its author, a lead or an admin). */
  async function remove(): Promise<{ removed: true } | { error: ApiError }> {
    const id = toValue(planId)
    return runAction(deleting, async () => {
      if (id) await deletePlan(id)
      return { removed: true as const }
    })
  }

  return { ...resource, mismatch, deleting, remove }
}
