/** The signed-out account calls: ask for a reset link, set a new password, accept an invitation. */
import { shallowRef, type ShallowRef } from 'vue'
import type { AcceptInvitationInput, ResetInput, ResetRequestInput, SessionAnswer } from '../../shared/auth/schemas'
import { ApiError, apiRequest } from '../api/client'

export interface AuthCall<I, O> {
  /** Run the call; resolves to the answer, or null after a failure (see `error`). */
  run: (input: I) => Promise<O | null>
  /** True while the request is in flight. */
  busy: ShallowRef<boolean>
  /** The last failure, or null. */
  error: ShallowRef<ApiError | null>
}

function authCall<I, O>(path: string): AuthCall<I, O> {
  const busy = shallowRef(false)
  const error = shallowRef<ApiError | null>(null)
  async function run(input: I): Promise<O | null> {
    busy.value = true
    error.value = null
    try {
      return await apiRequest<O>(path, { method: 'POST', body: input })
    } catch (caught) {
      error.value = caught instanceof ApiError ? caught : new ApiError(0, 'unknown', String(caught))
      return null
    } finally {
      busy.value = false
    }
  }
  return { run, busy, error }
}

export function useAuthResetRequest() {
  return authCall<ResetRequestInput, { message: string }>('/auth/reset-request')
}

export function useAuthReset() {
  return authCall<ResetInput, { message: string }>('/auth/reset')
}

export function useAuthAcceptInvitation() {
  return authCall<AcceptInvitationInput, SessionAnswer>('/invitations/accept')
}

/** The token after `#token=` in a link from an e-mail (kept out of the address the server sees). */
export function linkTokenFromHash(hash: string): string {
  return new URLSearchParams(hash.replace(/^#/, '')).get('token') ?? ''
}
