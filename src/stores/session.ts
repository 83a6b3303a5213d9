/** The signed-in person, app-wide: loaded once from `GET /api/auth/me`, changed by sign-in and sign-out. */
import { defineStore } from 'pinia'
import { computed, shallowRef } from 'vue'
import type { Action } from '../../shared/auth/permissions'
import type { LoginInput, SessionAnswer, SessionUser } from '../../shared/auth/schemas'
import { ApiError, apiRequest } from '../api/client'

export const useSessionStore = defineStore('session', () => {
  /** The signed-in person, or null when signed out (or not yet known). */
  const user = shallowRef<SessionUser | null>(null)
  /** True once the server has been asked who is signed in. */
  const known = shallowRef(false)
  /** True when someone is signed in. */
  const signedIn = computed(() => user.value !== null)
  let pending: Promise<void> | undefined

  let checkedAt = 0

  /**
   * Ask the server who is signed in, unless it was asked less than `maxAgeMs` ago (so an expired or
   * ended session is noticed on the next navigation). A 401 simply means signed out.
   */
  function load(options: { maxAgeMs?: number } = {}): Promise<void> {
    const { maxAgeMs = Number.POSITIVE_INFINITY } = options
    if (known.value && Date.now() - checkedAt < maxAgeMs) return Promise.resolve()
    pending ??= apiRequest<SessionAnswer>('/auth/me')
      .then((answer) => {
        user.value = answer.user
        checkedAt = Date.now()
      })
      .catch((error: unknown) => {
        if (!(error instanceof ApiError) || error.status !== 401) throw error
        user.value = null
        checkedAt = Date.now()
      })
      .finally(() => {
        known.value = true
        pending = undefined
      })
    return pending
  }

  /** Sign in; rejects with the server's ApiError (wrong credentials, rate limit, …). */
  async function signIn(input: LoginInput): Promise<SessionUser> {
    const answer = await apiRequest<SessionAnswer>('/auth/login', { method: 'POST', body: input })
    user.value = answer.user
    known.value = true
    checkedAt = Date.now()
    return answer.user
  }

  /** Take a session the server has just opened (e.g. after accepting an invitation). */
  function adopt(next: SessionUser): void {
    user.value = next
    known.value = true
    checkedAt = Date.now()
  }

  /** Sign out here and end the server-side session. */
  async function signOut(): Promise<void> {
    try {
      await apiRequest<void>('/auth/logout', { method: 'POST' })
    } finally {
      user.value = null
      known.value = true
    }
  }

  /** May the signed-in person perform `action`? False when signed out. */
  function can(action: Action): boolean {
    return user.value?.permissions.includes(action) ?? false
  }

  return { user, known, signedIn, load, signIn, adopt, signOut, can }
})
