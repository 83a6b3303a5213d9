/** The kinds of maintenance-log entry (`GET /api/log-kinds`), and adding one (leads and admins). */
import { shallowRef } from 'vue'
import { addLogKind, listLogKinds, type LogKind } from '../api/logbook'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useLogKinds() {
  const resource = useCavitraceLoader<LogKind[]>('log-kinds', (_key, signal) => listLogKinds(signal).then((answer) => answer.kinds))
  /** Whether an add is in flight. */
  const adding = shallowRef(false)

  async function add(label: string): Promise<{ kind: LogKind } | { error: ApiError }> {
    return runAction(adding, async () => {
      const answer = await addLogKind(label)
      await resource.reload({ quiet: true })
      return answer
    })
  }

  return { ...resource, adding, add }
}
