/**
 * What the signed-in person may do, for showing or hiding the cavity, upload and re-analysis controls.
 * Reads the app-wide session store (the same permission table as the route guards); the server enforces
 * every rule, this only spares people buttons that would be refused.
 */
import type { Action } from '../../shared/auth/permissions'
import { useSessionStore } from '../stores/session'

export function useCavitraceAccess() {
  const session = useSessionStore()
  /** Whether the current person's role allows `action` (false while signed out). */
  const can = (action: Action) => session.can(action)
  return { can }
}
