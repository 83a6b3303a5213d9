/** The lab's cavities (`GET /api/cavities`) and creating one. */
import { shallowRef } from 'vue'
import { createCavity, listCavities, type Cavity, type CavityInput } from '../api/cavities'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useCavities(options: { archived?: boolean } = {}) {
  const resource = useCavitraceLoader('cavities', (_key, signal) => listCavities({ archived: options.archived, signal }).then((answer) => answer.cavities))
  /** Whether a create request is in flight. */
  const saving = shallowRef(false)

  /** Create a cavity; resolves to the stored cavity, or to the server's refusal as an ApiError. */
  async function create(input: CavityInput): Promise<{ cavity: Cavity } | { error: ApiError }> {
    return runAction(saving, async () => {
      const { cavity } = await createCavity(input)
      await resource.reload({ quiet: true })
      return { cavity }
    })
  }

  return { ...resource, saving, create }
}
