/** Deleted traces an admin can still restore (`GET /api/deleted-traces`), and restoring one. */
import { shallowRef } from 'vue'
import { restoreTrace, type DeletedTrace } from '../api/corrections'
import { useApiResource } from './useApiResource'
import { runAction } from './useCavitraceLoader'

export function useDeletedTraces() {
  const resource = useApiResource<{ traces: DeletedTrace[] }>('/deleted-traces')
  /** Whether a restore is in flight. */
  const restoring = shallowRef(false)
  /** Restore one trace with its analyses, then list again. */
  async function restore(traceId: string) {
    const outcome = await runAction(restoring, () => restoreTrace(traceId))
    await resource.reload()
    return outcome
  }
  return { ...resource, restoring, restore }
}
