/** Cavities waiting for approval, and proposing, approving or turning one down (each resolves to its answer or `{ error }`). */
import { shallowRef } from 'vue'
import { approveCavity, listProposals, proposeCavity, rejectProposal, type CavityInput } from '../api/cavities'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useCavityProposals() {
  const resource = useCavitraceLoader('proposals', (_key, signal) => listProposals(signal).then((answer) => answer.cavities))
  /** Whether a request is in flight. */
  const busy = shallowRef(false)
  const andReload = <T extends object>(work: () => Promise<T>) =>
    runAction(busy, async () => {
      const answer = await work()
      await resource.reload({ quiet: true })
      return answer
    })
  return {
    ...resource,
    busy,
    propose: (input: CavityInput) => andReload(() => proposeCavity(input)),
    approve: (id: string) => andReload(() => approveCavity(id)),
    reject: (id: string) =>
      andReload(async () => {
        await rejectProposal(id)
        return { rejected: true as const }
      }),
  }
}
