/**
 * Load one API resource into reactive `{ data, error, state }`, with `reload()`.
 * Aborts the request when the calling component's scope ends.
 */
import { onScopeDispose, shallowRef, type ShallowRef } from 'vue'
import { ApiError, apiRequest } from '../api/client'

export type ResourceState = 'idle' | 'loading' | 'ready' | 'error'

export interface ApiResource<T> {
  /** The last successful answer, or null. */
  data: ShallowRef<T | null>
  /** The last failure, or null. */
  error: ShallowRef<ApiError | null>
  /** Where the request stands. */
  state: ShallowRef<ResourceState>
  /** Fetch again. */
  reload: () => Promise<void>
}

export function useApiResource<T>(path: string, options: { immediate?: boolean } = {}): ApiResource<T> {
  const { immediate = true } = options
  const data = shallowRef<T | null>(null)
  const error = shallowRef<ApiError | null>(null)
  const state = shallowRef<ResourceState>('idle')
  let controller: AbortController | undefined

  async function reload(): Promise<void> {
    controller?.abort()
    controller = new AbortController()
    state.value = 'loading'
    try {
      data.value = await apiRequest<T>(path, { signal: controller.signal })
      error.value = null
      state.value = 'ready'
    } catch (caught) {
      if (controller.signal.aborted) return
      error.value = caught instanceof ApiError ? caught : new ApiError(0, 'unknown', String(caught))
      state.value = 'error'
    }
  }

  onScopeDispose(() => controller?.abort())
  if (immediate) void reload()
  return { data, error, state, reload }
}
