/** Mail caught by the development SMTP fake, for admins. */
import type { OutboxMessage } from '../../shared/auth/schemas'
import { useApiResource } from './useApiResource'

export function useAdminOutbox() {
  return useApiResource<{ messages: OutboxMessage[] }>('/outbox')
}
