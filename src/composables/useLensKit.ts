/** The lab's lens kit (`GET /api/lenses`) with add, edit, delete and CSV import, each reloading the list. */
import { shallowRef } from 'vue'
import { createLens, deleteLens, editLens, importLensCsv, listLenses, type Lens, type LensImportResult, type LensInput, type LensPatch } from '../api/planner'
import type { ApiError } from '../api/client'
import { runAction, useCavitraceLoader } from './useCavitraceLoader'

export function useLensKit() {
  const resource = useCavitraceLoader('lenses', (_key, signal) => listLenses(signal).then((answer) => answer.lenses))
  /** Whether a change is in flight. */
  const saving = shallowRef(false)

  const after = async <T extends object>(work: () => Promise<T>): Promise<T | { error: ApiError }> =>
    runAction(saving, async () => {
      const answer = await work()
      await resource.reload({ quiet: true })
      return answer
    })

  /** Add a lens; resolves to it or to the server's refusal. */
  const add = (input: LensInput) => after(() => createLens(input))
  /** Edit a lens. */
  const edit = (id: string, patch: LensPatch) => after(() => editLens(id, patch))
  /** Delete a lens (saved plans keep their own copy). */
  const remove = (id: string): Promise<{ removed: true } | { error: ApiError }> => after(async () => (await deleteLens(id), { removed: true as const }))
  /** Import a CSV file: all lines or none. */
  const importCsv = (file: File): Promise<LensImportResult | { error: ApiError }> => after(() => importLensCsv(file))

  return { ...resource, saving, add, edit, remove, importCsv }
}

export type { Lens }
