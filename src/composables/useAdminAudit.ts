/** The audit log for admins, newest first, one page at a time. */
import type { AuditEntry } from '../../shared/auth/schemas'
import { useApiResource } from './useApiResource'

export function useAdminAudit(options: { limit?: number } = {}) {
  const { limit = 200 } = options
  return useApiResource<{ events: AuditEntry[] }>(`/audit?limit=${limit}`)
}
