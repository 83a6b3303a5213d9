/**
 * What the signed-in person may do, for showing or hiding the cavity, upload and re-analysis controls.
 * The server enforces every rule; this only spares people buttons that would be refused.
 */
import type { Action } from '../../shared/auth/permissions'
import type { SessionAnswer } from '../../shared/auth/schemas'
import { useApiResource } from './useApiResource'

export function useCavitraceAccess() {
  const session = useApiResource<SessionAnswer>('/auth/me')
  /** Whether the current person's role allows `action` (false until the session is known). */
  const can = (action: Action) => session.data.value?.user.permissions.includes(action) ?? false
  return { session, can }
}
