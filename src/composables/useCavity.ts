/** One cavity with its computed model (`GET /api/cavities/:id`), and editing it. */
import { shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { editCavity, getCavity, type Cavity, type CavityPatch } from '../api/cavities'
import type { ApiError } from '../api/client'
import { asApiError, runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useCavity(id: MaybeRefOrGetter<string | null | undefined>) {
  const resource = useCavitraceLoader(id, (key, signal) => getCavity(key, signal))
  /** Whether an edit is in flight. */
  const saving = shallowRef(false)

  /** Save an edit; the card is reloaded so the computed model follows the new geometry. */
  async function save(patch: CavityPatch): Promise<{ cavity: Cavity } | { error: ApiError }> {
    const key = toValue(id)
    if (!key) return { error: asApiError(new Error('No cavity is open.')) }
    return runAction(saving, async () => {
      const { cavity } = await editCavity(key, patch)
      await resource.reload({ quiet: true })
      return { cavity }
    })
  }

  return { ...resource, saving, save }
}
