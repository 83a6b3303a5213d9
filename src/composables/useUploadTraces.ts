/** Upload one or several exports to a cavity, with progress (`POST /api/cavities/:id/traces`). */
import { computed, onScopeDispose, shallowRef, toValue, type MaybeRefOrGetter } from 'vue'
import { uploadTraces, type UploadOutcome } from '../api/cavities'
import type { ApiError } from '../api/client'
import { asApiError } from './useCavitraceLoader'

export type UploadState = 'idle' | 'uploading' | 'done' | 'error'

export function useUploadTraces(cavityId: MaybeRefOrGetter<string | null | undefined>) {
  /** The last upload's answer: one outcome per file. */
  const data = shallowRef<UploadOutcome[] | null>(null)
  const error = shallowRef<ApiError | null>(null)
  const state = shallowRef<UploadState>('idle')
  const loadedBytes = shallowRef(0)
  const totalBytes = shallowRef(0)
  /** Upload progress in percent (0–100), or null while the size is unknown. */
  const percent = computed(() => (totalBytes.value > 0 ? Math.min(100, (100 * loadedBytes.value) / totalBytes.value) : null))
  let controller: AbortController | undefined

  async function upload(files: File[], note = '', sampleIntervalSeconds?: number): Promise<UploadOutcome[] | null> {
    const id = toValue(cavityId)
    if (!id || files.length === 0) return null
    controller?.abort()
    controller = new AbortController()
    state.value = 'uploading'
    error.value = null
    loadedBytes.value = 0
    totalBytes.value = files.reduce((sum, file) => sum + file.size, 0)
    try {
      const answer = await uploadTraces(id, {
        files,
        note,
        sampleIntervalSeconds,
        signal: controller.signal,
        onProgress: (progress) => {
          loadedBytes.value = progress.loadedBytes
          if (progress.totalBytes > 0) totalBytes.value = progress.totalBytes
        },
      })
      data.value = answer.uploads
      loadedBytes.value = totalBytes.value
      state.value = 'done'
      return answer.uploads
    } catch (caught) {
      error.value = asApiError(caught)
      state.value = 'error'
      return null
    }
  }

  onScopeDispose(() => controller?.abort())
  return { data, error, state, percent, upload }
}
