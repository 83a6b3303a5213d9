/**
 * Load an API answer that depends on a reactive key (a route id): `{ data, error, state, reload }`.
 * A new key aborts the request in flight and loads again; the request is aborted when the scope ends.
 * `reload({ quiet: true })` refreshes without going back to the 'loading' state, for live updates.
 */
import { onScopeDispose, shallowRef, toValue, watch, type MaybeRefOrGetter, type ShallowRef } from 'vue'
import { ApiError } from '../api/client'
import type { ResourceState } from './useApiResource'

export interface KeyedResource<T> {
  data: ShallowRef<T | null>
  error: ShallowRef<ApiError | null>
  state: ShallowRef<ResourceState>
  reload: (options?: { quiet?: boolean }) => Promise<void>
}

export function useCavitraceLoader<T>(key: MaybeRefOrGetter<string | null | undefined>, load: (key: string, signal: AbortSignal) => Promise<T>): KeyedResource<T> {
  const data = shallowRef<T | null>(null)
  const error = shallowRef<ApiError | null>(null)
  const state = shallowRef<ResourceState>('idle')
  let controller: AbortController | undefined

  async function reload(options: { quiet?: boolean } = {}): Promise<void> {
    const current = toValue(key)
    controller?.abort()
    if (!current) {
      data.value = null
      state.value = 'idle'
      return
    }
    const mine = (controller = new AbortController())
    if (!options.quiet || state.value !== 'ready') state.value = 'loading'
    try {
      const answer = await load(current, mine.signal)
      if (mine.signal.aborted) return
      data.value = answer
      error.value = null
      state.value = 'ready'
    } catch (caught) {
      if (mine.signal.aborted) return
      error.value = caught instanceof ApiError ? caught : new ApiError(0, 'unknown', caught instanceof Error ? caught.message : String(caught))
      state.value = 'error'
    }
  }

  watch(
    () => toValue(key),
    (next, previous) => {
      if (next !== previous) data.value = null
      void reload()
    },
    { immediate: true },
  )
  onScopeDispose(() => controller?.abort())
  return { data, error, state, reload }
}

/** The error of a failed action as an ApiError, whatever was thrown. */
export function asApiError(caught: unknown): ApiError {
  return caught instanceof ApiError ? caught : new ApiError(0, 'unknown', caught instanceof Error ? caught.message : String(caught))
}

/**
 * Run a write (create, edit, re-analyse) with a busy flag: resolves to its answer, or to `{ error }` with
 * the server's refusal, so forms can show the message without try/catch of their own.
 */
export async function runAction<T extends object>(busy: ShallowRef<boolean>, work: () => Promise<T>): Promise<T | { error: ApiError }> {
  busy.value = true
  try {
    return await work()
  } catch (caught) {
    return { error: asApiError(caught) }
  } finally {
    busy.value = false
  }
}
