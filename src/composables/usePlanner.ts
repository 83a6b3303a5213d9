/**
 * The planner's answer for one cavity: `run(request)` asks the server for ranked lens arrangements and the
 * pictures (a new run aborts the one in flight); `save(...)` stores a chosen arrangement as a plan.
 */
import { onScopeDispose, shallowRef, toValue, watch, type MaybeRefOrGetter } from 'vue'
import { planCavity, savePlan, type PlanAnswer, type PlanRequest, type PlanSave, type SavedPlan } from '../api/planner'
import type { ApiError } from '../api/client'
import type { ResourceState } from './useApiResource'
import { asApiError, runAction } from './useCavitraceLoader'

export function usePlanner(cavityId: MaybeRefOrGetter<string | null | undefined>) {
  /** The last answer (kept while a new one loads, so the pictures do not blink). */
  const answer = shallowRef<PlanAnswer | null>(null)
  /** The request that gave `answer`. */
  const request = shallowRef<PlanRequest | null>(null)
  const error = shallowRef<ApiError | null>(null)
  const state = shallowRef<ResourceState>('idle')
  const saving = shallowRef(false)
  let controller: AbortController | undefined

  async function run(next: PlanRequest): Promise<void> {
    const id = toValue(cavityId)
    if (!id) return
    controller?.abort()
    const mine = (controller = new AbortController())
    state.value = 'loading'
    try {
      const result = await planCavity(id, next, mine.signal)
      if (mine.signal.aborted) return
      answer.value = result
      request.value = next
      error.value = null
      state.value = 'ready'
    } catch (caught) {
      if (mine.signal.aborted) return
      error.value = asApiError(caught)
      state.value = 'error'
    }
  }

  /** Save the lenses of a chosen arrangement (or ideal lenses) with the inputs of the current answer. */
  async function save(lenses: PlanSave['lenses'], note: string): Promise<{ plan: SavedPlan } | { error: ApiError }> {
    const id = toValue(cavityId)
    const inputs = request.value
    if (!id || !inputs) return { error: asApiError(new Error('Find lenses first, then save one of the arrangements.')) }
    return runAction(saving, () => savePlan(id, { inputs: { ...inputs, pathArrangement: undefined, mapArrangement: undefined }, lenses, note }))
  }

  // Another cavity: the answer and its request belong to the old one.
  watch(
    () => toValue(cavityId),
    () => {
      controller?.abort()
      answer.value = null
      request.value = null
      error.value = null
      state.value = 'idle'
    },
  )
  onScopeDispose(() => controller?.abort())
  return { answer, request, error, state, saving, run, save }
}
