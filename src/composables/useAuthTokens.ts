/** The signed-in person's API tokens (or, with `all`, everyone's for admins): list, create, revoke. */
import { shallowRef } from 'vue'
import type { CreatedToken, TokenSummary } from '../../shared/auth/schemas'
import { ApiError, apiRequest } from '../api/client'
import { useApiResource } from './useApiResource'

export function useAuthTokens(options: { all?: boolean } = {}) {
  const { all = false } = options
  const list = useApiResource<{ tokens: TokenSummary[] }>(all ? '/tokens?all=1' : '/tokens')
  /** The secret of the token created last: shown once, then forgotten with `dismissSecret`. */
  const freshSecret = shallowRef<CreatedToken | null>(null)
  /** The last failed create or revoke. */
  const actionError = shallowRef<ApiError | null>(null)

  async function attempt(work: () => Promise<void>): Promise<void> {
    actionError.value = null
    try {
      await work()
    } catch (caught) {
      actionError.value = caught instanceof ApiError ? caught : new ApiError(0, 'unknown', String(caught))
    }
  }

  const create = (name: string) =>
    attempt(async () => {
      freshSecret.value = await apiRequest<CreatedToken>('/tokens', { method: 'POST', body: { name } })
      await list.reload()
    })

  const revoke = (id: number) =>
    attempt(async () => {
      await apiRequest(`/tokens/${id}`, { method: 'DELETE' })
      await list.reload()
    })

  const dismissSecret = () => {
    freshSecret.value = null
  }

  return { ...list, freshSecret, actionError, create, revoke, dismissSecret }
}
