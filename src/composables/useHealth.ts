/** The service's health (`GET /api/health`), for the status line in the app frame. */
import type { HealthStatus } from '../api/client'
import { useApiResource } from './useApiResource'

export function useHealth() {
  return useApiResource<HealthStatus>('/health')
}
