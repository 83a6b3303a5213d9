/** People and invitations for the admin pages: list, invite, change role, disable or enable. */
import { shallowRef } from 'vue'
import type { InvitationInput, InvitationSummary, UserPatchInput, UserSummary } from '../../shared/auth/schemas'
import { ApiError, apiRequest } from '../api/client'
import { useApiResource } from './useApiResource'

export function useAdminPeople() {
  const people = useApiResource<{ users: UserSummary[] }>('/users')
  const invitations = useApiResource<{ invitations: InvitationSummary[] }>('/invitations')
  /** The last failed change, shown above the table. */
  const actionError = shallowRef<ApiError | null>(null)

  async function attempt<T>(work: () => Promise<T>): Promise<T | null> {
    actionError.value = null
    try {
      return await work()
    } catch (caught) {
      actionError.value = caught instanceof ApiError ? caught : new ApiError(0, 'unknown', String(caught))
      return null
    }
  }

  /** Change a person; reloads the list either way so it shows the truth. */
  const change = (id: number, patch: UserPatchInput) =>
    attempt(() => apiRequest<{ user: UserSummary }>(`/users/${id}`, { method: 'PATCH', body: patch })).finally(() => people.reload())

  /** Invite an address; rejects with the ApiError so the dialog can show it. */
  async function invite(input: InvitationInput): Promise<InvitationSummary> {
    const answer = await apiRequest<{ invitation: InvitationSummary }>('/invitations', { method: 'POST', body: input })
    await invitations.reload()
    return answer.invitation
  }

  return { people, invitations, actionError, change, invite }
}
